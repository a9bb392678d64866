import {
  Alignment,
  Button,
  Menu,
  MenuDivider,
  MenuItem,
  Navbar,
  NavbarDivider,
  NavbarGroup,
  NavbarHeading,
  Popover,
} from '@blueprintjs/core';
import { Link, NavLink, Outlet } from 'react-router';
import { useSignOut } from '../api/auth';
import { useAuth } from '../hooks/useAuth';
import { Wordmark } from './Wordmark';

export function AppShell() {
  const auth = useAuth();
  const signOut = useSignOut();
  const user = auth.status === 'signed-in' ? auth.user : null;

  return (
    <div className="ff-app">
      <Navbar className="ff-navbar">
        <NavbarGroup align={Alignment.START}>
          <NavbarHeading>
            <Link to="/desk" className="ff-brand-link" aria-label="Foldfolio Desk">
              <Wordmark />
            </Link>
          </NavbarHeading>
          <NavbarDivider />
          <NavLink to="/desk" className="ff-navlink">
            Desk
          </NavLink>
          {user?.siteRole === 'admin' && (
            <NavLink to="/admin" className="ff-navlink">
              Admin
            </NavLink>
          )}
        </NavbarGroup>
        {user && (
          <NavbarGroup align={Alignment.END}>
            <Popover
              placement="bottom-end"
              content={
                <Menu>
                  <MenuItem disabled text={user.email} icon="envelope" />
                  <MenuDivider />
                  <MenuItem
                    icon="log-out"
                    text="Sign out"
                    onClick={() => signOut.mutate(undefined)}
                  />
                </Menu>
              }
            >
              <Button variant="minimal" icon="user" endIcon="caret-down" text={user.displayName} />
            </Popover>
          </NavbarGroup>
        )}
      </Navbar>
      <main className="ff-main">
        <Outlet />
      </main>
    </div>
  );
}
