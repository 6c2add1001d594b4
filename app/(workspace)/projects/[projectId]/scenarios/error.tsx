"use client";

import { Alert } from "@/components/ui/alert";
import { Button } from "@/components/ui/button";

/** Shown when a scenarios page fails to load; the digest lets the server logs be matched. */
export default function ScenariosError({ error, reset }: { error: Error & { digest?: string }; reset: () => void }) {
  return (
    <div className="py-10">
      <Alert
        tone="error"
        title="The scenario could not be loaded"
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
