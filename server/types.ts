import type { Role } from '../shared/schemas/auth.schema';

/** Who is asking: every service call is scoped by this. */
export type Actor = {
  userId: string;
  workspaceId: string;
  role: Role;
  /** Growers the actor may see: null means every grower of the workspace (admin, agronomist). */
  growerScope: string[] | null;
};

declare module 'express-serve-static-core' {
  interface Request {
    actor?: Actor;
  }
}
