import { NotFoundView } from "@/components/shell/not-found-view";

/** A project that does not exist or that the viewer is not a member of (the project layout's 404): the same words for both. */
export default function ProjectNotFound() {
  return <NotFoundView title="Project not found" description="It does not exist, or you are not a member. Ask its owner for an invitation." />;
}
