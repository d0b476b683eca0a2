import type { BrowserContext } from 'playwright-core';

export declare const CHROMIUM: string;
export declare function openChromium(): Promise<{ context: BrowserContext; close: () => Promise<void> }>;
