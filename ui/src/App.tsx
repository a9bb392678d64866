import { QueryClient, QueryClientProvider } from '@tanstack/react-query';
import { createBrowserRouter, Navigate } from 'react-router';
import { RouterProvider } from 'react-router/dom';
import { ApiError } from './api/client';
import { AppShell } from './components/AppShell';
import { RequireAdmin, RequireSignedIn } from './components/Guards';
import { AuthProvider } from './hooks/useAuth';
import { AcceptInvitationPage } from './routes/AcceptInvitation';
import { DeskPage } from './routes/Desk';
import { NotFoundPage } from './routes/NotFound';
import { RegisterPage } from './routes/Register';
import { ResetConfirmPage, ResetRequestPage } from './routes/ResetPassword';
import { SignInPage } from './routes/SignIn';
import { AdminLayout } from './routes/admin/AdminLayout';
import { OutboxPage } from './routes/admin/OutboxPage';
import { UsersPage } from './routes/admin/UsersPage';
import { WorkspacePage } from './routes/manuscript/Workspace';
import { ReviewerPage } from './routes/ReviewerPage';
import { VerifyPage } from './routes/VerifyPage';

const queryClient = new QueryClient({
  defaultOptions: {
    queries: {
      // a 4xx answer (no access, not found) will not change by asking again
      retry: (count, err) =>
        !(err instanceof ApiError && err.status >= 400 && err.status < 500) && count < 2,
      staleTime: 15_000,
      refetchOnWindowFocus: true,
    },
  },
});

const router = createBrowserRouter([
  { path: '/sign-in', element: <SignInPage /> },
  { path: '/register', element: <RegisterPage /> },
  { path: '/reset-password', element: <ResetRequestPage /> },
  { path: '/reset-password/:token', element: <ResetConfirmPage /> },
  { path: '/invitations/:token', element: <AcceptInvitationPage /> },
  // reviewers follow a link without an account
  { path: '/review/:token', element: <ReviewerPage /> },
  {
    element: (
      <RequireSignedIn>
        <AppShell />
      </RequireSignedIn>
    ),
    children: [
      { path: '/', element: <Navigate to="/desk" replace /> },
      { path: '/desk', element: <DeskPage /> },
      { path: '/manuscripts/:id', element: <WorkspacePage /> },
      { path: '/manuscripts/:id/:tab', element: <WorkspacePage /> },
      { path: '/verify', element: <VerifyPage /> },
      {
        path: '/admin',
        element: (
          <RequireAdmin>
            <AdminLayout />
          </RequireAdmin>
        ),
        children: [
          { index: true, element: <Navigate to="/admin/users" replace /> },
          { path: 'users', element: <UsersPage /> },
          { path: 'outbox', element: <OutboxPage /> },
          { path: 'outbox/:messageId', element: <OutboxPage /> },
        ],
      },
      { path: '*', element: <NotFoundPage /> },
    ],
  },
]);

export function App() {
  return (
    <QueryClientProvider client={queryClient}>
      <AuthProvider>
        <RouterProvider router={router} />
      </AuthProvider>
    </QueryClientProvider>
  );
}
