// Filters kept in the address (search params) that survive quick successive changes. React
// Router applies a search-param change only after the route's loaders ran, so a second
// change made before then (two fields filled in quick succession) would start from the old
// address and undo the first. Here the screen's own state is the source of truth and is
// written through to the address; an address change the screen did not make (a link to the
// same screen with other filters) is adopted.
import { useState } from "react";
import { useSearchParams } from "react-router-dom";

type State = { view: string; written: string[]; seen: string };

/** The search params as the screen last set them, and a function that changes some of them (empty value = remove). */
export function useSearchState(): [URLSearchParams, (changes: Record<string, string | undefined | null>) => void] {
  const [params, setParams] = useSearchParams();
  const current = params.toString();
  const [state, setState] = useState<State>({ view: current, written: [current], seen: current });

  // The address moved: our own write catching up keeps the view; anything else replaces it.
  if (current !== state.seen) {
    const ours = state.written.includes(current);
    setState({ view: ours ? state.view : current, written: ours ? state.written : [current], seen: current });
  }

  const update = (changes: Record<string, string | undefined | null>) => {
    const next = new URLSearchParams(state.view);
    for (const [k, v] of Object.entries(changes)) {
      if (v) next.set(k, v);
      else next.delete(k);
    }
    const text = next.toString();
    setState((s) => ({ ...s, view: text, written: [...s.written.slice(-19), text] }));
    setParams(next, { replace: true });
  };

  return [new URLSearchParams(state.view), update];
}
