import 'server-only';
import { seedDemoBilling } from '@/lib/dev/seed/billing';
import { seedModels } from '@/lib/dev/seed/models';
import { seedClients } from '@/lib/dev/seed/clients';
import { seedDatasets } from '@/lib/dev/seed/datasets';

/** The demo firm's billing account, its two published models, its measured datasets, then its clients with passes to those widgets. */
export async function seedDemoExtras(firmId: string): Promise<void> {
  await seedDemoBilling(firmId);
  await seedModels(firmId);
  await seedDatasets(firmId);
  await seedClients(firmId);
}
