import { Spinner } from "@/components/ui/spinner";

export default function ScenariosLoading() {
  return (
    <div className="flex items-center justify-center py-16">
      <Spinner label="Loading scenarios…" />
    </div>
  );
}
