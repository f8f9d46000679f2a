// The reviewer's queue: what waits, what I hold, and "Start next".
import { PageHeader } from "../../../components/ui/page-header";

export default function QueuePage() {
  return <PageHeader title="Queue" />;
}
