"use client";

import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";

/** Shown when loading a projects page fails; the digest lets the server logs be matched. */
export default function ProjectsError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="py-10">
      <Alert
        tone="error"
        title="This page could not be loaded"
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
