"use client";

import { RouteError, type RouteErrorProps } from "@/components/shell/route-error";

export default function WorkspaceError(props: RouteErrorProps) {
  return <RouteError title="The scenario could not be loaded" {...props} />;
}
