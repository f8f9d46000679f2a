// The caution every screen carries.
export function SiteFooter() {
  return (
    <footer className="border-t border-slate-200 px-4 py-4 text-xs leading-relaxed text-slate-600 sm:px-6">
      <p className="max-w-3xl">
        Soundings supports education and quality review. It does not make diagnoses; local policy and licensed practice govern clinical decisions and
        privileges.
      </p>
    </footer>
  );
}
