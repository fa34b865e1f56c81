// heic-decode ships no types; this covers the two calls photo-processing.ts makes.
declare module "heic-decode" {
  interface HeicImageData {
    width: number;
    height: number;
    /** RGBA, 4 bytes a pixel, rows top to bottom. */
    data: Uint8ClampedArray;
  }
  interface HeicImageHandle {
    width: number;
    height: number;
    decode(): Promise<HeicImageData>;
  }
  function decode(input: { buffer: Uint8Array | ArrayBuffer }): Promise<HeicImageData>;
  namespace decode {
    function all(input: { buffer: Uint8Array | ArrayBuffer }): Promise<HeicImageHandle[] & { dispose(): void }>;
  }
  export default decode;
}
