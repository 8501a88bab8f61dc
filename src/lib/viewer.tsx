import { createContext, useContext, type ReactNode } from 'react';
import type { Me } from '@shared/schemas/auth.schema';
import type { UnitSystem } from '@shared/units';

/**
 * The signed-in user, provided once by the app shell so any screen can read the role and the unit system
 * without reaching into the auth feature.
 */
const ViewerContext = createContext<Me | null>(null);

export function ViewerProvider({ me, children }: { me: Me; children: ReactNode }) {
  return <ViewerContext.Provider value={me}>{children}</ViewerContext.Provider>;
}

export function useViewer(): Me {
  const me = useContext(ViewerContext);
  if (!me) throw new Error('useViewer needs a signed-in user (ViewerProvider)');
  return me;
}

export const useUnitSystem = (): UnitSystem => useViewer().unitSystem;
