import { sequence } from 'astro:middleware';
import { originRule, prepare, securityHeaders, toolsQuota } from './lib/server/middleware/steps';
import { fillLocals } from './lib/server/middleware/locals';

export const onRequest = sequence(securityHeaders, prepare, originRule, toolsQuota, fillLocals);
