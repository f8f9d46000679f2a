// A thin bar while the next screen's code or guard loads, so a slow click still shows it was heard.
import { useNavigation } from "react-router-dom";

export function RouteProgress() {
  const navigation = useNavigation();
  if (navigation.state === "idle") return null;
  return (
    <div role="status" className="fixed inset-x-0 top-0 z-50 h-1 overflow-hidden bg-sea-100">
      <div className="h-full w-1/3 animate-pulse bg-sea-600" />
      <span className="sr-only">Loading</span>
    </div>
  );
}
