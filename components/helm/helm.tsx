"use client";

import { Command } from "cmdk";
import { usePathname, useRouter } from "next/navigation";
import { useCallback, useEffect, useMemo, useRef, useState } from "react";
import { loadExpressions } from "@/lib/browser/expressions";
import useSWR from "swr";
import { Compass } from "lucide-react";
import type { RuleSpec } from "@/engine/types";
import { Kbd } from "@/components/ui";
import { fetchJson } from "@/lib/browser/api-client";
import { rankHelmItem } from "./rank";
import { MAIN_CONTENT_ID } from "@/components/shell/app-header";
import { cn } from "@/components/ui/cn";
import { buildCommands, type HelmCommand, type HelmProject, type HelmStep } from "./commands";
import { useHelmRegistry } from "./helm-context";
import { readRecent, rememberRecent } from "./recent";

const itemClass =
  "flex cursor-pointer items-center justify-between gap-3 rounded px-3 py-2 text-sm text-ink data-[selected=true]:bg-ink data-[selected=true]:text-on-ink";
const groupClass = "[&_[cmdk-group-heading]]:px-3 [&_[cmdk-group-heading]]:pt-2 [&_[cmdk-group-heading]]:pb-1 [&_[cmdk-group-heading]]:text-xs [&_[cmdk-group-heading]]:tracking-wide [&_[cmdk-group-heading]]:text-muted [&_[cmdk-group-heading]]:uppercase";

type Pending = { command: HelmCommand; values: Record<string, unknown>; step: HelmStep };

function projectIdFrom(pathname: string): string | null {
  const m = pathname.match(/^\/projects\/([^/?#]+)/);
  return m ? decodeURIComponent(m[1]) : null;
}

/**
 * The helm: Ctrl/Cmd+K on every signed-in page. Type to search commands (checks, actions, navigation),
 * arrows to move, Enter to run; commands with arguments ask for them in steps (Enter accepts the default
 * shown first; Backspace in an empty field goes back). Only what the viewer's role allows is listed.
 */
export function Helm() {
  const router = useRouter();
  const pathname = usePathname() ?? "";
  const { current, version, open, setOpen, docked, setOpener } = useHelmRegistry();
  const [search, setSearch] = useState("");
  const [pending, setPending] = useState<Pending | null>(null);
  const [error, setError] = useState<string | null>(null);
  const [recent, setRecent] = useState<string[]>([]);

  const page = current();
  const projectId = page?.projectId ?? projectIdFrom(pathname);
  const { data: projectsData } = useSWR<{ projects: HelmProject[] }>(open ? "/api/projects" : null, fetchJson);
  const { data: scenariosData } = useSWR<{ scenarios: { id: string; name: string }[] }>(open && projectId ? `/api/projects/${projectId}/scenarios` : null, fetchJson);
  const { data: partsData } = useSWR<{ parts: { id: string; name: string; fileName: string }[] }>(open && projectId ? `/api/projects/${projectId}/parts` : null, fetchJson);
  const { data: rulesData } = useSWR<{ rules: { spec: RuleSpec }[] }>(open && projectId ? `/api/projects/${projectId}/rules` : null, fetchJson);

  // the answers to commands are read as expressions ("2.4 GHz", "20 dBm"): have the reader ready by then
  useEffect(() => {
    if (open) void loadExpressions();
  }, [open]);

  // where the focus was when the helm opened (Ctrl+K has no trigger button to return to)
  const returnFocus = useRef<HTMLElement | null>(null);

  /** Open or close, starting afresh each time (no half-answered command survives a close). */
  const changeOpen = useCallback(
    (next: boolean) => {
      setPending(null);
      setSearch("");
      setError(null);
      if (next) {
        setRecent(readRecent());
        returnFocus.current = document.activeElement instanceof HTMLElement && document.activeElement !== document.body ? document.activeElement : null;
      } else {
        // After the dialog's own close handling: back where the person was, or (when that is gone, e.g.
        // the command navigated) the page's main content, never the document body.
        const back = returnFocus.current;
        returnFocus.current = null;
        window.setTimeout(() => {
          if (document.activeElement && document.activeElement !== document.body) return;
          if (back && back.isConnected) back.focus();
          else document.getElementById(MAIN_CONTENT_ID)?.focus();
        }, 0);
      }
      setOpen(next);
    },
    [setOpen],
  );

  useEffect(() => {
    setOpener(() => changeOpen(true));
    return () => setOpener(null);
  }, [changeOpen, setOpener]);

  useEffect(() => {
    const onKey = (e: KeyboardEvent) => {
      if ((e.ctrlKey || e.metaKey) && !e.altKey && e.key.toLowerCase() === "k") {
        e.preventDefault();
        changeOpen(!open);
      }
    };
    window.addEventListener("keydown", onKey);
    return () => window.removeEventListener("keydown", onKey);
  }, [open, changeOpen]);

  const projects = useMemo(() => projectsData?.projects ?? [], [projectsData]);
  const role = page?.role ?? projects.find((p) => p.id === projectId)?.role ?? null;
  const commands = useMemo(
    () =>
      buildCommands({
        navigate: (href) => router.push(href),
        projects,
        projectId,
        role,
        scenarios: scenariosData?.scenarios ?? [],
        parts: partsData?.parts ?? [],
        rules: (rulesData?.rules ?? []).map((r) => r.spec),
        page,
      }),
    // `version` changes when a scenario page registers or leaves; `page` is read from a ref
    // eslint-disable-next-line react-hooks/exhaustive-deps
    [router, projects, projectId, role, scenariosData, partsData, rulesData, version, open],
  );

  const finish = useCallback(
    (command: HelmCommand, values: Record<string, unknown>) => {
      setRecent(rememberRecent(command.id));
      changeOpen(false);
      void Promise.resolve(command.run(values)).catch(() => undefined);
    },
    [changeOpen],
  );

  const advance = useCallback(
    (command: HelmCommand, values: Record<string, unknown>) => {
      const step = command.next?.(values) ?? null;
      if (!step) {
        finish(command, values);
        return;
      }
      setPending({ command, values, step });
      setError(null);
      setSearch(step.kind === "text" ? step.initial : "");
    },
    [finish],
  );

  const back = () => {
    if (!pending) return;
    const keys = Object.keys(pending.values);
    if (keys.length === 0) {
      setPending(null);
      setSearch("");
      return;
    }
    const values = { ...pending.values };
    delete values[keys[keys.length - 1]];
    advance(pending.command, values);
  };

  const confirmText = () => {
    if (!pending || pending.step.kind !== "text") return;
    const parsed = pending.step.parse(search);
    if (!parsed.ok) {
      setError(parsed.error);
      return;
    }
    advance(pending.command, { ...pending.values, [pending.step.key]: parsed.value });
  };

  const byId = new Map(commands.map((c) => [c.id, c]));
  const recentCommands = recent.map((id) => byId.get(id)).filter((c): c is HelmCommand => Boolean(c));
  const groups = (["Checks", "Actions", "Navigation"] as const).map((g) => ({ group: g, items: commands.filter((c) => c.group === g && !recent.includes(c.id)) }));
  const step = pending?.step ?? null;

  const renderCommand = (c: HelmCommand) => (
    <Command.Item key={c.id} value={c.id} keywords={[c.title, ...(c.keywords ?? [])]} onSelect={() => advance(c, {})} className={itemClass}>
      <span>{c.title}</span>
      {c.shortcut ? (
        <span className="flex gap-1" aria-label={`Shortcut ${c.shortcut.join(" ")}`}>
          {c.shortcut.map((k) => (
            <Kbd key={k}>{k}</Kbd>
          ))}
        </span>
      ) : null}
    </Command.Item>
  );

  return (
    <>
      {docked ? null : (
        <button
          type="button"
          onClick={() => changeOpen(true)}
          title="Open the helm (Ctrl+K)"
          aria-keyshortcuts="Control+K Meta+K"
          className="fixed right-4 bottom-4 z-30 inline-flex items-center gap-2 rounded-full border-[1.5px] border-ink bg-surface px-3 py-1.5 text-sm text-ink shadow-[2px_2px_0_0_var(--pt-rule)] hover:bg-sunken focus-visible:outline-2 focus-visible:outline-offset-2 focus-visible:outline-focus"
        >
          <Compass aria-hidden="true" className="h-4 w-4" /> Helm
          <span className="flex gap-0.5" aria-hidden="true">
            <Kbd>Ctrl</Kbd>
            <Kbd>K</Kbd>
          </span>
        </button>
      )}
      <Command.Dialog
        open={open}
        onOpenChange={changeOpen}
        label="Helm"
        shouldFilter={step?.kind !== "text"}
        filter={rankHelmItem}
        loop
        overlayClassName="fixed inset-0 z-40 bg-ink/25"
        contentClassName="fixed top-[10vh] left-1/2 z-50 w-[min(40rem,94vw)] -translate-x-1/2 rounded-card border-[1.5px] border-ink bg-surface shadow-xl"
      >
        {pending ? (
          <div className="flex items-center gap-2 border-b border-rule px-3 pt-2 pb-1 text-xs text-muted">
            <span className="font-medium text-ink">{pending.command.title}</span>
            {Object.values(pending.values).map((v, i) => (
              <span key={i} className="font-mono">
                › {Array.isArray(v) ? (typeof v[0] === "object" ? `${v.length} source${v.length === 1 ? "" : "s"}` : v.join("–")) : String(v)}
              </span>
            ))}
            <span>› {pending.step.prompt}</span>
          </div>
        ) : null}
        <Command.Input
          value={search}
          onValueChange={(v) => {
            setSearch(v);
            setError(null);
          }}
          onKeyDown={(e) => {
            if (e.key === "Backspace" && search === "" && pending) {
              e.preventDefault();
              back();
            }
          }}
          aria-label={step ? step.prompt : "Search commands"}
          placeholder={step ? (step.kind === "text" ? (step.hint ?? step.prompt) : `${step.prompt}…`) : "Run a check, act on the scenario, or go somewhere…"}
          className="h-11 w-full border-b border-rule bg-transparent px-3 text-sm text-ink outline-none placeholder:text-muted"
        />
        <Command.List className="max-h-[55vh] overflow-y-auto p-1.5" aria-label={step ? step.prompt : "Commands"}>
          {step?.kind === "text" ? (
            <>
              <Command.Item value="confirm" onSelect={confirmText} className={itemClass}>
                <span>
                  {step.prompt}: <span className="font-mono">{search || "…"}</span>
                </span>
                <Kbd>Enter</Kbd>
              </Command.Item>
              {error ? (
                <p role="alert" className="px-3 py-2 text-sm text-fail-strong">
                  {error}
                </p>
              ) : step.hint ? (
                <p className="px-3 py-1 text-xs text-muted">{step.hint}</p>
              ) : null}
            </>
          ) : step?.kind === "choose" ? (
            <>
              <Command.Empty className="px-3 py-6 text-center text-sm text-muted">{step.options.length === 0 ? "Nothing to choose from." : "Nothing matches."}</Command.Empty>
              {step.options.map((o) => (
                <Command.Item
                  key={o.value}
                  value={o.value}
                  keywords={[o.label, o.hint ?? ""]}
                  onSelect={() => advance(pending!.command, { ...pending!.values, [step.key]: o.value })}
                  className={itemClass}
                >
                  <span className="font-mono">{o.label}</span>
                  {o.hint ? <span className="text-xs opacity-75">{o.hint}</span> : null}
                </Command.Item>
              ))}
            </>
          ) : (
            <>
              <Command.Empty className="px-3 py-6 text-center text-sm text-muted">No command matches.</Command.Empty>
              {recentCommands.length > 0 ? (
                <Command.Group heading="Recent" className={groupClass}>
                  {recentCommands.map(renderCommand)}
                </Command.Group>
              ) : null}
              {groups.map(({ group, items }) =>
                items.length > 0 ? (
                  <Command.Group key={group} heading={group} className={groupClass}>
                    {items.map(renderCommand)}
                  </Command.Group>
                ) : null,
              )}
            </>
          )}
        </Command.List>
        <div className={cn("flex flex-wrap items-center gap-x-3 gap-y-1 border-t border-rule px-3 py-1.5 text-xs text-muted")}>
          <span>
            <Kbd>↑</Kbd> <Kbd>↓</Kbd> move
          </span>
          <span>
            <Kbd>Enter</Kbd> {step ? "accept" : "run"}
          </span>
          {pending ? (
            <span>
              <Kbd>Backspace</Kbd> back
            </span>
          ) : null}
          <span>
            <Kbd>Esc</Kbd> close
          </span>
          <span className="ml-auto">
            <Kbd>Ctrl</Kbd> <Kbd>K</Kbd> helm
          </span>
        </div>
      </Command.Dialog>
    </>
  );
}
