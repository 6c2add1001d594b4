"use client";

import { useEffect, useId, useRef, useState, type ReactNode } from "react";
import { Button, type ButtonProps } from "./button";
import { cn } from "./cn";
import { controlClassName } from "./control-class";

export type ConfirmDialogProps = {
  open: boolean;
  /** Called on Cancel, Escape or a click outside the dialog. */
  onClose: () => void;
  /** Called on Confirm. The dialog stays open while a returned promise is pending; close it yourself via `open`. */
  onConfirm: () => void | Promise<void>;
  title: string;
  description?: ReactNode;
  confirmLabel?: string;
  cancelLabel?: string;
  /** When set, Confirm stays disabled until exactly this text is typed (e.g. the project's name). */
  confirmText?: string;
  /** Danger styles the confirm button as destructive (the default). */
  tone?: "danger" | "primary";
  /** Shows a spinner on Confirm (for work the caller tracks, e.g. a transition). */
  pending?: boolean;
  /** Error text to show inside the dialog (e.g. the server refused). */
  error?: string | null;
  children?: ReactNode;
};

/**
 * A modal confirmation on the native <dialog>: the browser traps focus, closes on Escape and returns
 * focus to the element that opened it.
 */
export function ConfirmDialog({
  open,
  onClose,
  onConfirm,
  title,
  description,
  confirmLabel = "Confirm",
  cancelLabel = "Cancel",
  confirmText,
  tone = "danger",
  pending = false,
  error,
  children,
}: ConfirmDialogProps) {
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();
  const descId = useId();
  const inputId = useId();
  const [typed, setTyped] = useState("");
  const [busy, setBusy] = useState(false);

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) {
      setTyped("");
      dialog.showModal();
    }
    if (!open && dialog.open) dialog.close();
  }, [open]);

  const working = pending || busy;
  const blocked = confirmText !== undefined && typed !== confirmText;

  async function handleConfirm() {
    if (blocked || working) return;
    const result = onConfirm();
    if (!(result instanceof Promise)) return;
    setBusy(true);
    try {
      await result;
    } finally {
      setBusy(false);
    }
  }

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      aria-describedby={description ? descId : undefined}
      onCancel={(e) => {
        e.preventDefault();
        if (!working) onClose();
      }}
      onClick={(e) => {
        // A click on the backdrop lands on the dialog element itself.
        if (e.target === e.currentTarget && !working) onClose();
      }}
      className={cn(
        "m-auto w-[min(28rem,calc(100vw-2rem))] rounded-card border border-rule bg-surface p-0 text-ink shadow-xl",
        "open:flex open:flex-col",
      )}
    >
      <form
        method="dialog"
        className="flex flex-col gap-4 p-5"
        onSubmit={(e) => {
          e.preventDefault();
          void handleConfirm();
        }}
      >
        <h2 id={titleId} className="text-lg font-semibold">
          {title}
        </h2>
        {description ? (
          <div id={descId} className="text-sm text-muted">
            {description}
          </div>
        ) : null}
        {children}
        {confirmText !== undefined ? (
          <div className="flex flex-col gap-1.5">
            <label htmlFor={inputId} className="text-sm font-medium">
              Type <span className="rounded bg-sunken px-1 font-mono">{confirmText}</span> to confirm
            </label>
            <input
              id={inputId}
              autoFocus
              autoComplete="off"
              spellCheck={false}
              value={typed}
              onChange={(e) => setTyped(e.target.value)}
              className={cn(controlClassName, "h-9")}
            />
          </div>
        ) : null}
        {error ? (
          <p role="alert" className="text-sm font-medium text-fail-strong">
            {error}
          </p>
        ) : null}
        <div className="flex justify-end gap-2 pt-1">
          <Button variant="secondary" onClick={onClose} disabled={working} autoFocus={confirmText === undefined}>
            {cancelLabel}
          </Button>
          <Button type="submit" variant={tone === "danger" ? "danger" : "primary"} disabled={blocked} loading={working}>
            {confirmLabel}
          </Button>
        </div>
      </form>
    </dialog>
  );
}

export type ConfirmButtonProps = Omit<ConfirmDialogProps, "open" | "onClose"> & {
  /** The trigger's content, e.g. "Delete project". */
  children: ReactNode;
  /** Props of the trigger button. */
  buttonProps?: Omit<ButtonProps, "onClick" | "children">;
  /** Content shown inside the dialog, above the buttons. */
  dialogBody?: ReactNode;
};

/** A button that asks for confirmation in a ConfirmDialog before running `onConfirm`. Closes when it resolves. */
export function ConfirmButton({ children, buttonProps, dialogBody, onConfirm, ...dialog }: ConfirmButtonProps) {
  const [open, setOpen] = useState(false);
  return (
    <>
      <Button variant="danger" {...buttonProps} onClick={() => setOpen(true)}>
        {children}
      </Button>
      <ConfirmDialog
        {...dialog}
        open={open}
        onClose={() => setOpen(false)}
        onConfirm={async () => {
          await onConfirm();
          setOpen(false);
        }}
      >
        {dialogBody}
      </ConfirmDialog>
    </>
  );
}
