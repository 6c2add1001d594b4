import type { SelectOption } from "@/components/ui/select";

export const ROLE_OPTIONS: SelectOption[] = [
  { value: "owner", label: "Owner" },
  { value: "engineer", label: "Engineer" },
  { value: "reviewer", label: "Reviewer" },
];
