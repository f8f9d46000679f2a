// Placeholder while the screen is built (issue 6); replaced by the real page.
import { PageHeader } from "../../../components/ui/page-header";

export default function Page() {
  return <PageHeader title="Reports" />;
}
