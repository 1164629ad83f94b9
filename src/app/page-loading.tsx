import { Spinner } from "@/components/ui/spinner";

export function PageLoading() {
  return (
    <div className="grid min-h-dvh place-items-center">
      <Spinner label="Loading Tinelog…" />
    </div>
  );
}
