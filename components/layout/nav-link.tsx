"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";

/**
 * A navigation link that marks the section the reader is in: aria-current="page" and `activeClassName`
 * (otherwise `inactiveClassName`; kept apart so conflicting utilities never meet on one element).
 * `exact` links (home pages) are current only on their own path; others also on the pages below them.
 */
export function NavLink({
  href,
  exact = false,
  className,
  activeClassName,
  inactiveClassName,
  children,
}: {
  href: string;
  exact?: boolean;
  className: string;
  activeClassName: string;
  inactiveClassName: string;
  children: React.ReactNode;
}) {
  const pathname = usePathname();
  const current = pathname === href || (!exact && pathname.startsWith(`${href}/`));
  return (
    <Link href={href} aria-current={current ? "page" : undefined} className={`${className} ${current ? activeClassName : inactiveClassName}`}>
      {children}
    </Link>
  );
}
