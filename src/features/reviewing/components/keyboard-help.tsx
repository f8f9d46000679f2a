// The keyboard help panel of the scoring workspace (opened with ?): every shortcut in one table.
import type { ReactNode } from "react";
import { Dialog } from "../../../components/ui/dialog";
import { Button } from "../../../components/ui/button";
import { Kbd } from "../../../components/ui/kbd";

const GROUPS: { title: string; rows: [ReactNode, string][] }[] = [
  {
    title: "Rubric",
    rows: [
      [<Kbd key="d">1</Kbd>, "…to 9 (0 for the tenth): pick that level of the focused criterion"],
      [<Kbd key="t">Tab</Kbd>, "next criterion or finding (also Enter)"],
      [
        <span key="st" className="inline-flex gap-1">
          <Kbd>Shift</Kbd> <Kbd>Tab</Kbd>
        </span>,
        "previous one (also Shift+Enter)",
      ],
      [<Kbd key="u">↑ ↓</Kbd>, "move between the levels of the focused criterion"],
      [
        <span key="pni" className="inline-flex gap-1">
          <Kbd>P</Kbd> <Kbd>N</Kbd> <Kbd>I</Kbd>
        </span>,
        "on a finding: positive, negative, indeterminate",
      ],
      [
        <span key="ce" className="inline-flex gap-1">
          <Kbd>Ctrl</Kbd> <Kbd>Enter</Kbd>
        </span>,
        "submit and open the next exam (works in the feedback box too)",
      ],
    ],
  },
  {
    title: "Player (anywhere but the feedback box)",
    rows: [
      [<Kbd key="s">Space</Kbd>, "play or pause"],
      [<Kbd key="lr">← →</Kbd>, "pause and step one frame back or on"],
      [
        <span key="br" className="inline-flex gap-1">
          <Kbd>[</Kbd> <Kbd>]</Kbd>
        </span>,
        "previous or next clip",
      ],
      [
        <span key="sp" className="inline-flex gap-1">
          <Kbd>-</Kbd> <Kbd>=</Kbd>
        </span>,
        "slower or faster (0.25× to 2×)",
      ],
      [<Kbd key="l">L</Kbd>, "loop on or off"],
      [<Kbd key="q">?</Kbd>, "this help"],
    ],
  },
];

export function KeyboardHelp({ open, onClose }: { open: boolean; onClose: () => void }) {
  return (
    <Dialog open={open} title="Keyboard" onClose={onClose}>
      <div className="space-y-4 text-sm">
        {GROUPS.map((g) => (
          <div key={g.title}>
            <h3 className="mb-1 font-semibold text-ink-950">{g.title}</h3>
            <table className="w-full">
              <tbody>
                {g.rows.map(([keys, what], i) => (
                  <tr key={i} className="align-top">
                    <th scope="row" className="w-32 py-0.5 pr-3 text-left font-normal whitespace-nowrap">
                      {keys}
                    </th>
                    <td className="py-0.5 text-slate-700">{what}</td>
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        ))}
      </div>
      <div className="mt-5 flex justify-end">
        <Button variant="secondary" onClick={onClose}>
          Close
        </Button>
      </div>
    </Dialog>
  );
}
