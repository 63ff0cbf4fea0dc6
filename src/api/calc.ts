import type { DesignInputRaw, DesignResult } from '@/engine';
import { post } from './http';

/** Runs the engine on the server for a design document (the same code the Design desk runs in the browser). */
export const calculate = (design: DesignInputRaw): Promise<DesignResult> => post('/calc', { design });
