// Shown while the first route (and its session check) loads.
import { LoadingState } from "../../components/ui/states";

export function FullPageLoading() {
  return (
    <div className="grid min-h-screen place-items-center bg-paper">
      <LoadingState label="Loading Soundings…" />
    </div>
  );
}
