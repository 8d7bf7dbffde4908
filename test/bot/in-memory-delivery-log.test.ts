import { describe, expect, it } from 'vitest';
import { InMemoryDeliveryLog } from '../../src/bot/in-memory-delivery-log.ts';

describe('in-memory delivery log', () => {
  it('lets a key through once, and again only after its time to live', async () => {
    const log = new InMemoryDeliveryLog(1000);
    expect(await log.claim('event:Ev1', 0)).toBe(true);
    expect(await log.claim('event:Ev1', 999)).toBe(false);
    expect(await log.claim('event:Ev2', 999)).toBe(true);
    expect(await log.claim('event:Ev1', 1000)).toBe(true);
  });
});
