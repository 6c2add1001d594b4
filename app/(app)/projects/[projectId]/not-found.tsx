import { NotFoundView } from "@/components/shell/not-found-view";

/** A scenario, part or other id inside a project that does not exist (or not in this project). */
export default function ProjectItemNotFound() {
  return <NotFoundView title="Not found in this project" description="The scenario or page you asked for does not exist in this project. It may have been deleted." headingLevel={2} />;
}
