/**
 * node:v8's `deserialize`, except that every typed array, Buffer and DataView it returns owns its
 * memory. The default deserializer makes them views into the buffer it reads from, so one small
 * array kept from a cache entry keeps the whole file's bytes alive: with a warm cache at 1,000
 * buildings that was 133 MB of cache files held by 36-number arrays in the models.
 */
import { DefaultDeserializer } from "node:v8";

/** node:v8 documents `_readHostObject` as the hook to override; @types/node does not declare it. */
const readHostObject = (DefaultDeserializer.prototype as unknown as { _readHostObject(): unknown })._readHostObject;

class OwningDeserializer extends DefaultDeserializer {
  _readHostObject(): unknown {
    const view = readHostObject.call(this);
    if (Buffer.isBuffer(view)) {
      // not Buffer.from: small ones would come from Node's shared 8 KiB pool
      const copy = Buffer.allocUnsafeSlow(view.length);
      view.copy(copy);
      return copy;
    }
    if (view instanceof DataView) return new DataView(view.buffer.slice(view.byteOffset, view.byteOffset + view.byteLength));
    if (ArrayBuffer.isView(view)) return (view as unknown as { slice(): unknown }).slice();
    return view;
  }
}

/** Reads a value written by node:v8's `serialize`; arrays in it do not share `bytes`. */
export function deserializeOwned(bytes: Uint8Array): unknown {
  const reader = new OwningDeserializer(bytes);
  reader.readHeader();
  return reader.readValue();
}
