export { SignoffPanel, type SignoffPanelProps } from "./signoff-panel";
export { SignoffStateBadge } from "./signoff-state-badge";
export { ImportBundleForm } from "./import-bundle-form";
export { signoffUrls, STATE_LABELS, type SignoffItem } from "./types";
