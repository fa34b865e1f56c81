export {
  DISPLAY_SIZES,
  MAX_PHOTO_BYTES,
  MAX_PHOTO_MEGAPIXELS,
  PhotoRejected,
  inspectPhoto,
  renderDisplaySizes,
  sniffFormat,
  type DisplayImage,
  type DisplaySizeName,
  type PhotoFormat,
  type PhotoInspection,
  type PhotoRejectionCode,
} from "./photo-processing.ts";
export { StorageUnavailable, deleteObjects, displayKey, logPhotoKey, getObjectBytes, originalKey, putObject, type PutObjectOptions } from "./photo-storage.ts";
