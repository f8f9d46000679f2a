// The reviewer's own read of one finding, as a compact radio group. When the row has focus,
// P, N and I pick positive, negative or indeterminate; Enter moves on like Tab.
import { useId, type KeyboardEvent } from "react";
import type { FindingRead } from "../../../../shared/catalogue";
import { Kbd } from "../../../components/ui/kbd";
import { READ_LABELS } from "../../../lib/catalogue";
import { hasCommandModifier } from "../../../lib/keyboard";

const READS: { read: FindingRead; key: string }[] = [
  { read: "positive", key: "p" },
  { read: "negative", key: "n" },
  { read: "indeterminate", key: "i" },
];

export const findingStopId = (key: string) => `finding-${key}`;

type Props = {
  finding: { key: string; label: string; hint?: string };
  value: FindingRead | undefined;
  invalid: boolean;
  onChange: (read: FindingRead) => void;
  onAdvance: (direction: 1 | -1) => void;
};

export function FindingReadRow({ finding, value, invalid, onChange, onAdvance }: Props) {
  const id = useId();
  const onKeyDown = (e: KeyboardEvent<HTMLFieldSetElement>) => {
    if (hasCommandModifier(e)) return;
    if (e.key === "Enter") {
      e.preventDefault();
      onAdvance(e.shiftKey ? -1 : 1);
      return;
    }
    const match = READS.find((r) => r.key === e.key.toLowerCase());
    if (!match) return;
    e.preventDefault();
    onChange(match.read);
    e.currentTarget.querySelector<HTMLInputElement>(`input[value="${match.read}"]`)?.focus();
  };

  return (
    <fieldset
      id={findingStopId(finding.key)}
      data-stop
      role="radiogroup"
      aria-labelledby={`${id}-legend`}
      aria-invalid={invalid || undefined}
      onKeyDown={onKeyDown}
      className={
        "flex flex-wrap items-center justify-between gap-x-3 gap-y-1 rounded-md border bg-white px-2.5 py-1.5 focus-within:border-sea-600 focus-within:ring-1 focus-within:ring-sea-600 " +
        (invalid && !value ? "border-coral-500" : "border-slate-200")
      }
    >
      <legend id={`${id}-legend`} className="float-left text-sm font-semibold text-ink-950">
        {finding.label}
        {finding.hint ? <span className="block text-xs font-normal text-slate-600">{finding.hint}</span> : null}
      </legend>
      <div className="flex gap-1">
        {READS.map(({ read, key }) => {
          const checked = value === read;
          const inputId = `${id}-${read}`;
          return (
            <label
              key={read}
              htmlFor={inputId}
              className={
                "inline-flex cursor-pointer items-center gap-1 rounded px-1.5 py-0.5 text-sm " +
                (checked ? "bg-sea-50 font-semibold text-sea-800 ring-1 ring-sea-600" : "text-ink-900 hover:bg-paper-200")
              }
            >
              <input
                id={inputId}
                type="radio"
                name={`read-${finding.key}`}
                value={read}
                checked={checked}
                tabIndex={checked || (!value && read === "positive") ? 0 : -1}
                onChange={() => onChange(read)}
                aria-keyshortcuts={key.toUpperCase()}
                className="size-3.5 accent-sea-600"
              />
              {READ_LABELS[read]}
              <span aria-hidden="true">
                <Kbd>{key.toUpperCase()}</Kbd>
              </span>
            </label>
          );
        })}
      </div>
    </fieldset>
  );
}
