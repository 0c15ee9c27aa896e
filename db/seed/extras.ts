import 'server-only';
import { seedDemoBilling } from '@/db/seed/billing';
import { seedModels } from '@/db/seed/models';
import { seedClients } from '@/db/seed/clients';
import { seedDatasets } from '@/db/seed/datasets';

/** The demo firm's billing account, its two published models, its measured datasets, then its clients with passes to those widgets. */
export async function seedDemoExtras(firmId: string): Promise<void> {
  await seedDemoBilling(firmId);
  await seedModels(firmId);
  await seedDatasets(firmId);
  await seedClients(firmId);
}
