/**
 * The interval starts (Unix seconds) already read, per meter, in bounded memory: starts on a
 * 5-minute boundary — nearly all — are bits in one bitset per meter and UTC year (13 KB each);
 * the rare others go in a set.
 */
const SLOT_S = 300;
const YEAR_S = 366 * 86400;

export class StartsSeen {
  private bits = new Map<string, Uint8Array>();
  private odd = new Set<string>();

  has(meterId: string, startS: number): boolean {
    if (startS % SLOT_S !== 0) return this.odd.has(`${meterId}|${startS}`);
    const [bits, index] = this.slot(meterId, startS, false);
    return bits !== undefined && (bits[index >> 3]! & (1 << (index & 7))) !== 0;
  }

  add(meterId: string, startS: number): void {
    if (startS % SLOT_S !== 0) {
      this.odd.add(`${meterId}|${startS}`);
      return;
    }
    const [bits, index] = this.slot(meterId, startS, true);
    bits![index >> 3]! |= 1 << (index & 7);
  }

  private slot(meterId: string, startS: number, create: boolean): [Uint8Array | undefined, number] {
    const period = Math.floor(startS / YEAR_S);
    const key = `${meterId}|${period}`;
    let bits = this.bits.get(key);
    if (!bits && create) this.bits.set(key, (bits = new Uint8Array(Math.ceil(YEAR_S / SLOT_S / 8))));
    return [bits, Math.floor((startS - period * YEAR_S) / SLOT_S)];
  }
}
