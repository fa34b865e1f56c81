import type { DataSource } from "typeorm";
import type { AppConfig } from "../config.ts";
import { createPhotoStorage } from "../integrations/storage.ts";
import { createCatalogueService } from "../services/catalogue-service.ts";
import { storeSeedPhoto } from "../services/photo-service.ts";

/** The seed's demo photos go to the configured storage; live demo listings enter the catalogue. */
export function demoPhotoOptions(dataSource: DataSource, config: AppConfig) {
  const storage = createPhotoStorage(config.storage);
  const catalogue = createCatalogueService({ dataSource, cursorSecret: config.sessionSecret, cache: false });
  return {
    photos: (manager: Parameters<typeof storeSeedPhoto>[0], listingId: string, position: number, bytes: Buffer, altText: string) =>
      storeSeedPhoto(manager, storage, listingId, position, bytes, altText),
    onLive: (manager: Parameters<typeof storeSeedPhoto>[0], listingId: string) => catalogue.refreshEntry(manager, listingId),
    close: () => storage.close(),
  };
}

export async function withDemoPhotos<T>(
  dataSource: DataSource,
  config: AppConfig,
  work: (options: ReturnType<typeof demoPhotoOptions>) => Promise<T>,
): Promise<T> {
  const options = demoPhotoOptions(dataSource, config);
  try {
    return await work(options);
  } finally {
    options.close();
  }
}
