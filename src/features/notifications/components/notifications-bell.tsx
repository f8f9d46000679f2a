// The header bell: the unread count in words for assistive technology and as a badge, and a
// panel listing notifications. Opening one marks it read and goes to its exam's feedback.
import { useCallback, useId, useRef, useState } from "react";
import { useLocation, useNavigate } from "react-router-dom";
import { Bell, Dot } from "lucide-react";
import { formatDateTime } from "../../../lib/format";
import { notificationTarget, useMarkRead, useNotifications, type AppNotification } from "../api/notifications";
import { useDismiss } from "../../../lib/use-dismiss";

export function NotificationsBell() {
  const query = useNotifications();
  const markRead = useMarkRead();
  const [openOn, setOpenOn] = useState<string | null>(null);
  const location = useLocation();
  const navigate = useNavigate();
  const rootRef = useRef<HTMLDivElement>(null);
  const buttonRef = useRef<HTMLButtonElement>(null);
  const panelId = useId();
  const headingId = useId();
  const open = openOn === location.key;
  const unread = query.data?.unread ?? 0;

  const close = useCallback(() => setOpenOn(null), []);
  useDismiss(open, close, rootRef, buttonRef);

  function openNotification(n: AppNotification) {
    if (!n.read) markRead.mutate([n.id]);
    const to = notificationTarget(n);
    setOpenOn(null);
    if (to) navigate(to);
  }

  const label = unread === 0 ? "Notifications, none unread" : `Notifications, ${unread} unread`;

  return (
    <div
      ref={rootRef}
      className="relative"
      onBlur={(event) => {
        if (open && event.relatedTarget && !rootRef.current?.contains(event.relatedTarget as Node)) setOpenOn(null);
      }}
    >
      <button
        ref={buttonRef}
        type="button"
        aria-expanded={open}
        aria-controls={panelId}
        aria-label={label}
        onClick={() => setOpenOn(open ? null : location.key)}
        className="relative flex items-center rounded-md p-2 text-ink-900 hover:bg-paper-200"
      >
        <Bell aria-hidden="true" className="size-5" />
        {unread > 0 ? (
          <span
            aria-hidden="true"
            className="absolute -top-0.5 -right-0.5 min-w-5 rounded-full bg-sea-600 px-1 text-center text-xs font-semibold leading-5 tabular-nums text-white"
          >
            {unread > 99 ? "99+" : unread}
          </span>
        ) : null}
      </button>
      <div
        id={panelId}
        hidden={!open}
        role="region"
        aria-labelledby={headingId}
        className="absolute right-0 z-40 mt-2 w-80 rounded-lg border border-slate-200 bg-paper-50 text-sm shadow-lg"
      >
        <div className="flex items-center justify-between gap-2 border-b border-slate-200 px-4 py-2">
          <h2 id={headingId} className="font-semibold text-ink-950">
            Notifications
          </h2>
          <button
            type="button"
            disabled={unread === 0 || markRead.isPending}
            onClick={() => markRead.mutate(undefined)}
            className="rounded-md px-2 py-1 font-semibold text-sea-700 hover:bg-sea-50 disabled:cursor-not-allowed disabled:opacity-50"
          >
            Mark all read
          </button>
        </div>
        {query.isPending ? (
          <p className="px-4 py-3 text-slate-600">Loading…</p>
        ) : query.isError ? (
          <div className="px-4 py-3">
            <p className="text-coral-700">The notifications could not be loaded.</p>
            <button type="button" onClick={() => void query.refetch()} className="mt-1 font-semibold text-sea-700 underline-offset-2 hover:underline">
              Try again
            </button>
          </div>
        ) : query.data.items.length === 0 ? (
          <p className="px-4 py-3 text-slate-600">Nothing new. You will be told here when feedback is ready.</p>
        ) : (
          <ul className="max-h-96 divide-y divide-slate-100 overflow-y-auto">
            {query.data.items.map((n) => (
              <li key={n.id}>
                <button
                  type="button"
                  onClick={() => openNotification(n)}
                  className="flex w-full gap-2 px-4 py-2.5 text-left hover:bg-sea-50 focus-visible:bg-sea-50"
                >
                  <span className="w-12 shrink-0 pt-0.5 text-xs font-semibold">
                    {n.read ? (
                      <span className="text-slate-500">Read</span>
                    ) : (
                      <span className="inline-flex items-center text-sea-800">
                        <Dot aria-hidden="true" className="-ml-1.5 size-5" />
                        New
                      </span>
                    )}
                  </span>
                  <span className="min-w-0">
                    <span className={`block ${n.read ? "text-slate-700" : "font-semibold text-ink-950"}`}>{n.body}</span>
                    <span className="block text-xs tabular-nums text-slate-600">{formatDateTime(n.createdAt)}</span>
                  </span>
                </button>
              </li>
            ))}
          </ul>
        )}
      </div>
    </div>
  );
}
