import { createContext, useContext, useMemo, useState, type ReactNode } from 'react';
import { can, type Permission } from '@/constants/permissions';
import { useSession, type SchemeAccess } from './useSession';

type Ctx = { scheme: SchemeAccess | null; schemes: SchemeAccess[]; setSchemeId: (id: string) => void; can: (p: Permission) => boolean };
const CurrentSchemeContext = createContext<Ctx>({ scheme: null, schemes: [], setSchemeId: () => {}, can: () => false });

const STORAGE_KEY = 'keelson.scheme';

function stored(): string | null {
  try {
    return globalThis.localStorage?.getItem(STORAGE_KEY) ?? null;
  } catch {
    return null;
  }
}

/** Which of the user's schemes is in view; remembered on this device. */
export function CurrentSchemeProvider({ children }: { children: ReactNode }) {
  const { data: me } = useSession();
  const schemes = useMemo(() => me?.schemes ?? [], [me]);
  const [schemeId, setSchemeIdState] = useState<string | null>(stored);
  const scheme = schemes.find((s) => s.id === schemeId) ?? schemes[0] ?? null;
  const value = useMemo<Ctx>(
    () => ({
      scheme,
      schemes,
      setSchemeId: (id) => {
        setSchemeIdState(id);
        try {
          globalThis.localStorage?.setItem(STORAGE_KEY, id);
        } catch {
          /* private mode: keep it in memory only */
        }
      },
      can: (p) => can(scheme?.role, p),
    }),
    [scheme, schemes],
  );
  return <CurrentSchemeContext.Provider value={value}>{children}</CurrentSchemeContext.Provider>;
}

export function useCurrentScheme(): Ctx {
  return useContext(CurrentSchemeContext);
}
