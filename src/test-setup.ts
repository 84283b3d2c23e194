import { deserialize, serialize } from 'node:v8';
import { setupZonelessTestEnv } from 'jest-preset-angular/setup-env/zoneless';

setupZonelessTestEnv();

// jsdom (28) has no structuredClone; browsers and Node do. Node's v8 serializer is the same algorithm.
globalThis.structuredClone ??= <T>(value: T): T => deserialize(serialize(value)) as T;

// Nor object URLs (the timing diagram shows its SVG through one): a stand-in name is enough, no page loads it.
let objectUrls = 0;
URL.createObjectURL ??= () => `blob:jsdom/${++objectUrls}`;
URL.revokeObjectURL ??= () => undefined;
