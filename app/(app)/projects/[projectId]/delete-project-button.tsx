"use client";

import { useState } from "react";
import { Button } from "@/components/ui/button";
import { ConfirmDialog } from "@/components/ui/confirm-dialog";
import { deleteProjectAction } from "../actions";

/** Delete, after typing the project's name; the server checks the owner role (and the name) again. */
export function DeleteProjectButton({ projectId, projectName }: { projectId: string; projectName: string }) {
  const [open, setOpen] = useState(false);
  const [error, setError] = useState<string | null>(null);
  return (
    <>
      <Button variant="danger" onClick={() => setOpen(true)}>
        Delete project
      </Button>
      <ConfirmDialog
        open={open}
        onClose={() => {
          setError(null);
          setOpen(false);
        }}
        title={`Delete ${projectName}?`}
        description={`Type the project name (${projectName}) to confirm. Everything in the project is removed for every member.`}
        confirmText={projectName}
        confirmLabel="Delete project"
        error={error}
        onConfirm={async () => {
          setError(null);
          // On success the action redirects to /projects.
          const state = await deleteProjectAction({ projectId, confirmName: projectName });
          if (state.status === "error") setError(state.message ?? "The project could not be deleted.");
        }}
      />
    </>
  );
}
