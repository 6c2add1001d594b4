/**
 * The scenario workspace, for the page that hosts it:
 *
 *   <Workspace scenario={scenario} parts={parts} readOnly={false} onChange={setScenario}
 *              saveState="saved" toolbarExtras={<SaveButton />} />
 *
 * Fully controlled: every edit, undo and redo calls onChange with the next Scenario; the host saves it.
 * Blocks may carry `expr` (parameter name → expression text, e.g. { loss_db: "0.12 dB/m * L_feed" })
 * beside the evaluated numbers in `params`; the engine never reads it (scenarioForEngine strips it), so
 * a stored scenario should keep it. A placed part is a `touchstone` block with file "parts/<fileName>";
 * its data comes from `parts[].text` when solving (parts without text cannot be solved yet).
 * Keyboard: A add block, Delete/Backspace delete, Ctrl+C/V copy/paste, Ctrl+Z undo, Ctrl+Shift+Z or
 * Ctrl+Y redo, F fit view, Escape clear the selection.
 */
export { Workspace, type WorkspaceProps, type SaveState } from "./workspace";
