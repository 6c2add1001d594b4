import Link from "next/link";
import { EmptyState } from "@/components/ui/empty-state";

export default function ProjectNotFound() {
  return (
    <EmptyState
      className="my-10"
      title="Project not found"
      description="It does not exist, or you are not a member. Ask its owner for an invitation."
      action={
        <Link className="text-link" href="/projects">
          Back to your projects
        </Link>
      }
    />
  );
}
