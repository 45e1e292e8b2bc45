/**
 * Answers kept in memory under a key and the data version they were computed from. An answer is
 * used only while the version it was computed from is still the current one, so several app
 * servers stay correct without telling each other: each reads the current version (one small
 * query) and recomputes what is older. At most `limit` keys are kept; the oldest goes first.
 */
export class VersionedCache<T> {
  private readonly entries = new Map<string, { version: string; value: Promise<T> }>();

  constructor(private readonly limit: number) {}

  /**
   * The answer for `key` at `version`, computed by `compute` when none is kept. Concurrent callers
   * for the same key and version share one computation; a failed one is not kept. A `null`
   * version (unknown) always computes and keeps nothing.
   */
  get(key: string, version: string | null, compute: () => Promise<T>): Promise<T> {
    if (version === null) return compute();
    const kept = this.entries.get(key);
    if (kept && kept.version === version) {
      this.entries.delete(key);
      this.entries.set(key, kept);
      return kept.value;
    }
    const value = compute();
    const entry = { version, value };
    this.entries.delete(key);
    this.entries.set(key, entry);
    value.catch(() => {
      if (this.entries.get(key) === entry) this.entries.delete(key);
    });
    while (this.entries.size > this.limit) {
      const oldest = this.entries.keys().next().value as string;
      this.entries.delete(oldest);
    }
    return value;
  }

  clear(): void {
    this.entries.clear();
  }
}
