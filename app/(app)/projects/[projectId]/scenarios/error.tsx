"use client";

import { RouteError, type RouteErrorProps } from "@/components/shell/route-error";

export default function ScenariosError(props: RouteErrorProps) {
  return <RouteError title="The scenarios could not be loaded" {...props} />;
}
