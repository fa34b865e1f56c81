export {
  MAX_PHOTO_BYTES,
  cleanOriginal,
  inspectPhoto,
  mediumFromLarge,
  renderDisplaySizes,
  type DisplaySizeName,
} from "./photo-processing.ts";
export { deleteObjects, displayKey, logPhotoKey, getObjectBytes, originalKey, putObject } from "./photo-storage.ts";
