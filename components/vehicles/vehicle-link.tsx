import Link from "next/link";
import type { ReactNode } from "react";

/**
 * A vehicle's name, linked to its page for the roles that may open it; plain text for the rest
 * (a viewer reads the dashboards but not the vehicle pages, which would refuse them). Either
 * carries the vehicle's id in `data-vehicle-id`.
 */
export function VehicleLink({
  id,
  canOpen,
  className,
  children,
}: {
  id: number;
  canOpen: boolean;
  className?: string;
  children: ReactNode;
}) {
  return canOpen ? (
    <Link href={`/vehicles/${id}`} className={className} data-vehicle-id={id}>
      {children}
    </Link>
  ) : (
    <span className={className} data-vehicle-id={id}>
      {children}
    </span>
  );
}
