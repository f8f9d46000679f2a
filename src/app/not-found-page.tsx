// Any client address that matches no screen.
import { Link, useLocation } from "react-router-dom";
import { buttonClasses } from "../components/ui/button";
import { PageHeader } from "../components/ui/page-header";

export default function NotFoundPage() {
  const { pathname } = useLocation();
  return (
    <div>
      <PageHeader title="Page not found" />
      <p className="text-slate-700">
        There is no page at <code className="rounded bg-paper-200 px-1 py-0.5 text-sm">{pathname}</code>. It may have moved, or the link may be mistyped.
      </p>
      <Link to="/" className={buttonClasses("primary", "md", "mt-4")}>
        Go to Home
      </Link>
    </div>
  );
}
