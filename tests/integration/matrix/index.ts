/** Case lists contributed by each area of the app; add yours here. */
import type { PublicRoute, RouteCase } from './types';
import { vaultCases } from './vault-cases';

export const extraCases: RouteCase[] = [...vaultCases];

export const extraPublicRoutes: PublicRoute[] = [
  { method: 'POST', route: '/api/tools/convert', reason: 'public tools API, rate limited' },
  { method: 'POST', route: '/api/tools/checksum', reason: 'public tools API, rate limited' },
  { method: 'POST', route: '/api/tools/timing', reason: 'public tools API, rate limited' },
  { method: 'POST', route: '/api/tools/frame', reason: 'public tools API, rate limited' },
  { method: 'POST', route: '/api/tools/sequence', reason: 'public tools API, rate limited' },
  { method: 'POST', route: '/api/tools/bus-cycle', reason: 'public tools API, rate limited' },
  { method: 'POST', route: '/api/tools/st', reason: 'public tools API, rate limited' },
];

// Command library (issue 5).
import { commandCases } from './command-cases';
extraCases.push(...commandCases);

// Field work and sharing (issue 6).
import { fieldCases, fieldPublicRoutes } from './field-cases';
extraCases.push(...fieldCases);
extraPublicRoutes.push(...fieldPublicRoutes);

// Proposals from the field log (replacements and findings reaching the record).
import { proposalCases } from './proposal-cases';
extraCases.push(...proposalCases);
