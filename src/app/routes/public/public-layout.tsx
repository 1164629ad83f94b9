import { Outlet } from "react-router";

/**
 * Pages anyone may open without signing in: the invitation landing now, the certificate
 * verification page (/verify/:code) when certificates arrive. Nothing here reads `me` to decide access.
 */
export function PublicLayout() {
  return <Outlet />;
}
