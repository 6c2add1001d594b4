import { Spinner } from "@/components/ui/spinner";

export default function ProjectsLoading() {
  return (
    <div className="flex flex-1 items-center justify-center py-16">
      <Spinner label="Loading…" />
    </div>
  );
}
