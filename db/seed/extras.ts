import 'server-only';

/** Later capabilities (clients, models, datasets, billing) add their demo records here. */
export async function seedDemoExtras(firmId: string): Promise<void> {
  void firmId;
}
