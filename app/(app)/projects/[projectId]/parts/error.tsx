"use client";

import { RouteError, type RouteErrorProps } from "@/components/shell/route-error";

export default function PartsError(props: RouteErrorProps) {
  return <RouteError title="The parts could not be loaded" {...props} />;
}
