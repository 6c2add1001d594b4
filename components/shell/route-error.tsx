"use client";

import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";

export type RouteErrorProps = { error: Error & { digest?: string }; reset: () => void };

/** The body of a route's error.tsx: what failed, a retry, and the digest that matches the server logs. */
export function RouteError({ title, error, reset }: RouteErrorProps & { title: string }) {
  return (
    <div className="py-10">
      <Alert
        tone="error"
        title={title}
        actions={
          <Button variant="secondary" size="sm" onClick={reset}>
            Try again
          </Button>
        }
      >
        Something went wrong on the server.{error.digest ? ` Reference: ${error.digest}.` : ""}
      </Alert>
    </div>
  );
}
