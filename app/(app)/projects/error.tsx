"use client";

import { RouteError, type RouteErrorProps } from "@/components/shell/route-error";

export default function ProjectsError(props: RouteErrorProps) {
  return <RouteError title="This page could not be loaded" {...props} />;
}
