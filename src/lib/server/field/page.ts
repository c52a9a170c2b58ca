/** Shared steps of the field pages: the vault's page loader (guard, then a 404 status and body for records not found). */
export { loadPage as loadFieldPage, type PageLoad as PageResult } from '../vault/page';
