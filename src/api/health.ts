import type { Health } from '@/contracts';
import { get } from './http';

export type { Health };

/** Reads the server's health and feature flags. A degraded server answers 503 (thrown as ApiError). */
export const fetchHealth = (): Promise<Health> => get('/health');
