import type { Role } from '@ratewarden/shared/domain';
import { paths } from '../../config/paths';

/** Where each role starts after signing in: the page of its main job. */
export const landingOf: Record<Role, string> = {
  hygienist: paths.overview,
  safety_manager: paths.flags,
  physician: paths.flags,
  administrator: paths.admin,
};
