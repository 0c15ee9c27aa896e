import { EmbedNotice } from '@/components/embed/embed-notice';

// Inside the client's frame: the widget's own notice, no dashboard links and no script.
export default function EmbedNotFound() {
  return <EmbedNotice title="This widget is not here" body="The widget link may be incomplete. Ask your web team to paste the snippet again exactly as it was supplied." />;
}
