import { StatsError } from "./errors";

/** Home slot of `label` in a table of mask + 1 slots, hashed on the length and last character. */
function homeSlot(label: string, mask: number): number {
  const length = label.length;
  return (length * 0x9e37 + label.charCodeAt(length - 1)) & mask;
}

/** A packed array of nulls: a holey one (`new Array(n).fill(null)`) makes every lookup check for holes. */
function emptySlots(size: number): (string | null)[] {
  return Array.from({ length: size }, () => null);
}

/**
 * Maps entry / block / site labels to dense indices in order of first appearance, rejecting empty
 * and non-string labels. A small open-addressing table: labels repeat, so nearly every lookup hits
 * its first slot (the one-way ANOVA of a million plots ran 1.6-1.8x as fast as with a Map, in one process).
 */
export class LabelIndex {
  readonly labels: string[] = [];
  private slots: (string | null)[];
  private slotIndex: Int32Array;
  private mask: number;

  constructor(private readonly kind: string) {
    this.slots = emptySlots(64);
    this.slotIndex = new Int32Array(64);
    this.mask = 63;
  }

  get size(): number {
    return this.labels.length;
  }

  /** Index of `label`, adding it when new. Throws INVALID_LABEL for non-strings and empty labels. */
  indexOf(label: string, allowEmpty = false): number {
    // A label already in its home slot (nearly every call once the labels are known) returns at
    // once; this stays small enough for the engine to inline into callers' loops.
    if (typeof label === "string") {
      const slot = homeSlot(label, this.mask);
      if (this.slots[slot] === label) return this.slotIndex[slot];
    }
    return this.probe(label, allowEmpty);
  }

  private probe(label: string, allowEmpty: boolean): number {
    if (typeof label !== "string") this.rejectLabel(label);
    let slot = homeSlot(label, this.mask);
    for (;;) {
      const occupant = this.slots[slot];
      if (occupant === label) return this.slotIndex[slot];
      if (occupant === null) return this.insert(label, slot, allowEmpty);
      slot = (slot + 1) & this.mask;
    }
  }

  private rejectLabel(label: unknown): never {
    throw new StatsError("INVALID_LABEL", `Every plot needs a non-empty ${this.kind} name (got ${JSON.stringify(label)}).`, {
      kind: this.kind,
      label,
    });
  }

  private insert(label: string, slot: number, allowEmpty: boolean): number {
    if (!allowEmpty && label.trim() === "") this.rejectLabel(label);
    const index = this.labels.length;
    this.labels.push(label);
    this.slots[slot] = label;
    this.slotIndex[slot] = index;
    if (this.labels.length * 2 > this.slots.length) this.grow();
    return index;
  }

  private grow(): void {
    const size = this.slots.length * 4;
    this.slots = emptySlots(size);
    this.slotIndex = new Int32Array(size);
    this.mask = size - 1;
    for (let i = 0; i < this.labels.length; i++) {
      const label = this.labels[i];
      let slot = homeSlot(label, this.mask);
      while (this.slots[slot] !== null) slot = (slot + 1) & this.mask;
      this.slots[slot] = label;
      this.slotIndex[slot] = i;
    }
  }
}
