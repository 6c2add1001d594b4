"use client";

import { useEffect, useId, useRef, useState } from "react";
import { Button, Kbd } from "@/components/ui";

type Shortcut = { keys: string[][]; does: string };

// Kept beside the handlers they describe (workspace.tsx onKey, helm.tsx); change both together.
const GROUPS: { title: string; rows: Shortcut[] }[] = [
  {
    title: "Workspace",
    rows: [
      { keys: [["A"]], does: "Add a block (kind or project part)" },
      { keys: [["Delete"], ["Backspace"]], does: "Delete the selected blocks and links" },
      { keys: [["Ctrl", "Z"]], does: "Undo" },
      { keys: [["Ctrl", "Shift", "Z"], ["Ctrl", "Y"]], does: "Redo" },
      { keys: [["Ctrl", "C"]], does: "Copy the selected blocks" },
      { keys: [["Ctrl", "V"]], does: "Paste them, offset" },
      { keys: [["F"]], does: "Fit the chart in view" },
      { keys: [["Esc"]], does: "Clear the selection" },
      { keys: [["?"]], does: "This sheet" },
    ],
  },
  {
    title: "Helm",
    rows: [
      { keys: [["Ctrl", "K"]], does: "Open the helm (checks, actions, places)" },
      { keys: [["↑"], ["↓"]], does: "Move through the commands" },
      { keys: [["Enter"]], does: "Run the command, or accept the step's value" },
      { keys: [["Backspace"]], does: "Back one step (in an empty field)" },
      { keys: [["Esc"]], does: "Close the helm" },
    ],
  },
];

/** True while the person is typing somewhere the "?" key belongs to the field. */
function isTyping(target: EventTarget | null): boolean {
  if (!(target instanceof HTMLElement)) return false;
  if (target.isContentEditable) return true;
  const tag = target.tagName;
  return tag === "INPUT" || tag === "TEXTAREA" || tag === "SELECT" || target.closest("[role=dialog],[role=menu],dialog") !== null;
}

/** On "?" (outside fields) a dialog lists the workspace and helm shortcuts; Cmd stands for Ctrl on a Mac. */
export function ShortcutSheet() {
  const [open, setOpen] = useState(false);
  const ref = useRef<HTMLDialogElement>(null);
  const titleId = useId();

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if (e.key !== "?" || e.ctrlKey || e.metaKey || e.altKey || isTyping(e.target)) return;
      e.preventDefault();
      setOpen(true);
    };
    document.addEventListener("keydown", onKey);
    return () => document.removeEventListener("keydown", onKey);
  }, []);

  useEffect(() => {
    const dialog = ref.current;
    if (!dialog) return;
    if (open && !dialog.open) dialog.showModal();
    if (!open && dialog.open) dialog.close();
  }, [open]);

  return (
    <dialog
      ref={ref}
      aria-labelledby={titleId}
      onClose={() => setOpen(false)}
      onClick={(e) => {
        if (e.target === ref.current) setOpen(false);
      }}
      className="m-auto w-[min(36rem,calc(100vw-2rem))] rounded-card border border-rule bg-surface p-0 text-ink shadow-lg backdrop:bg-ink/30"
    >
      <div className="flex flex-col gap-3 p-4">
        <h2 id={titleId} className="text-base font-semibold">
          Keyboard shortcuts
        </h2>
        <div className="grid gap-4 sm:grid-cols-2">
          {GROUPS.map((g) => (
            <section key={g.title} aria-label={`${g.title} shortcuts`}>
              <h3 className="mb-1 text-sm font-semibold">{g.title}</h3>
              <dl className="flex flex-col gap-1 text-sm">
                {g.rows.map((r) => (
                  <div key={r.does} className="flex items-baseline justify-between gap-3">
                    <dt className="flex flex-wrap gap-1 whitespace-nowrap">
                      {r.keys.map((combo, i) => (
                        <span key={i} className="inline-flex gap-0.5">
                          {i > 0 ? <span className="px-0.5 text-muted">or</span> : null}
                          {combo.map((k) => (
                            <Kbd key={k}>{k}</Kbd>
                          ))}
                        </span>
                      ))}
                    </dt>
                    <dd className="text-right text-muted">{r.does}</dd>
                  </div>
                ))}
              </dl>
            </section>
          ))}
        </div>
        <p className="text-xs text-muted">On a Mac, Cmd works wherever Ctrl is shown. Shortcuts are off while you type in a field.</p>
        <div className="flex justify-end">
          <Button size="sm" variant="secondary" onClick={() => setOpen(false)} autoFocus>
            Close
          </Button>
        </div>
      </div>
    </dialog>
  );
}
