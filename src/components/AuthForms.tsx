import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { useMutation } from '@tanstack/react-query';
import { useState } from 'react';
import { QueryProvider } from './QueryProvider';
import { FormField } from './FormField';
import { api, ApiError } from '../lib/client/api';
import { forgotPasswordSchema, resetPasswordSchema, signInSchema, signUpSchema } from '../lib/schemas/platform';
import { safeNextPath } from '../lib/auth/next-path';
import { CONFIRM_LINK_HOURS } from '../lib/auth/policy';

type Mode = 'sign-in' | 'sign-up' | 'forgot' | 'reset';

const nextPath = (next: string | undefined) => safeNextPath(next, location.origin);

function authMessage(err: unknown): string {
  if (err instanceof ApiError) {
    if (err.status === 429) return 'Too many attempts. Wait a minute and try again.';
    if (err.status === 401 || err.body.code === 'INVALID_EMAIL_OR_PASSWORD') {
      return 'That e-mail and password do not match an account. Just created the account? Open the link we e-mailed you first.';
    }
    if (err.body.code === 'INVALID_TOKEN') return 'This reset link is invalid or has expired. Ask for a new one.';
    return err.message;
  }
  return 'Could not reach the server. Check your connection and try again.';
}

function SignIn({ next }: { next?: string }) {
  const form = useForm({ resolver: zodResolver(signInSchema), defaultValues: { email: '', password: '' } });
  const m = useMutation({
    mutationFn: (v: { email: string; password: string }) => api('/api/auth/sign-in/email', { body: { ...v, callbackURL: nextPath(next) ?? '/' } }),
    onSuccess: () => location.assign(nextPath(next) ?? '/'),
  });
  const e = form.formState.errors;
  return (
    <form onSubmit={form.handleSubmit((v) => m.mutate(v))} noValidate>
      {m.isError && <p className="notice notice-bad mb-3" role="alert">{authMessage(m.error)}</p>}
      <FormField id="email" label="E-mail" error={e.email?.message}>
        <input id="email" type="email" autoComplete="email" className="input" aria-invalid={!!e.email} {...form.register('email')} />
      </FormField>
      <FormField id="password" label="Password" error={e.password?.message}>
        <input id="password" type="password" autoComplete="current-password" className="input" aria-invalid={!!e.password} {...form.register('password')} />
      </FormField>
      <button className="btn w-full justify-center" disabled={m.isPending}>{m.isPending ? 'Signing in…' : 'Sign in'}</button>
    </form>
  );
}

function SignUp({ next }: { next?: string }) {
  const form = useForm({ resolver: zodResolver(signUpSchema), defaultValues: { name: '', email: '', password: '' } });
  // The same reply for a new address and a registered one: the next step is in the mailbox either way.
  const m = useMutation({
    mutationFn: (v: { name: string; email: string; password: string }) =>
      api('/api/auth/sign-up/email', { body: { ...v, callbackURL: nextPath(next) ?? '/teams/new' } }),
  });
  const e = form.formState.errors;
  if (m.isSuccess) {
    return (
      <div className="notice notice-ok" role="status">
        <p className="font-semibold">Check your e-mail</p>
        <p>We sent a message to {m.variables.email}. Open the link in it within {CONFIRM_LINK_HOURS} hours to confirm the address and sign in.</p>
        <p>Already have an account with this address? The message says so; <a href="/sign-in">sign in</a> instead.</p>
      </div>
    );
  }
  return (
    <form onSubmit={form.handleSubmit((v) => m.mutate(v))} noValidate>
      {m.isError && <p className="notice notice-bad mb-3" role="alert">{authMessage(m.error)}</p>}
      <FormField id="name" label="Your name" error={e.name?.message}>
        <input id="name" autoComplete="name" className="input" aria-invalid={!!e.name} {...form.register('name')} />
      </FormField>
      <FormField id="email" label="E-mail" error={e.email?.message}>
        <input id="email" type="email" autoComplete="email" className="input" aria-invalid={!!e.email} {...form.register('email')} />
      </FormField>
      <FormField id="password" label="Password" error={e.password?.message} hint="At least 10 characters.">
        <input id="password" type="password" autoComplete="new-password" className="input" aria-invalid={!!e.password} {...form.register('password')} />
      </FormField>
      <button className="btn w-full justify-center" disabled={m.isPending}>{m.isPending ? 'Creating…' : 'Create account'}</button>
    </form>
  );
}

function Forgot() {
  const [sent, setSent] = useState(false);
  const form = useForm({ resolver: zodResolver(forgotPasswordSchema), defaultValues: { email: '' } });
  const m = useMutation({
    mutationFn: (v: { email: string }) => api('/api/auth/request-password-reset', { body: { ...v, redirectTo: '/reset-password' } }),
    onSuccess: () => setSent(true),
  });
  const e = form.formState.errors;
  if (sent) return <p className="notice notice-ok" role="status">If an account uses that address, a reset link is on its way. It works for one hour.</p>;
  return (
    <form onSubmit={form.handleSubmit((v) => m.mutate(v))} noValidate>
      {m.isError && <p className="notice notice-bad mb-3" role="alert">{authMessage(m.error)}</p>}
      <FormField id="email" label="E-mail" error={e.email?.message}>
        <input id="email" type="email" autoComplete="email" className="input" aria-invalid={!!e.email} {...form.register('email')} />
      </FormField>
      <button className="btn w-full justify-center" disabled={m.isPending}>Send reset link</button>
    </form>
  );
}

function Reset({ token }: { token?: string }) {
  const form = useForm({ resolver: zodResolver(resetPasswordSchema), defaultValues: { password: '', confirm: '' } });
  const m = useMutation({
    mutationFn: (v: { password: string }) => api('/api/auth/reset-password', { body: { newPassword: v.password, token } }),
  });
  const e = form.formState.errors;
  if (!token) return <p className="notice notice-bad" role="alert">This page needs the link from the reset e-mail.</p>;
  if (m.isSuccess) {
    return <p className="notice notice-ok" role="status">Password changed. <a href="/sign-in">Sign in</a> with the new one.</p>;
  }
  return (
    <form onSubmit={form.handleSubmit((v) => m.mutate(v))} noValidate>
      {m.isError && <p className="notice notice-bad mb-3" role="alert">{authMessage(m.error)}</p>}
      <FormField id="password" label="New password" error={e.password?.message} hint="At least 10 characters.">
        <input id="password" type="password" autoComplete="new-password" className="input" aria-invalid={!!e.password} {...form.register('password')} />
      </FormField>
      <FormField id="confirm" label="Repeat the new password" error={e.confirm?.message}>
        <input id="confirm" type="password" autoComplete="new-password" className="input" aria-invalid={!!e.confirm} {...form.register('confirm')} />
      </FormField>
      <button className="btn w-full justify-center" disabled={m.isPending}>Set new password</button>
    </form>
  );
}

export default function AuthForm({ mode, next, token }: { mode: Mode; next?: string; token?: string }) {
  return (
    <QueryProvider>
      {mode === 'sign-in' && <SignIn next={next} />}
      {mode === 'sign-up' && <SignUp next={next} />}
      {mode === 'forgot' && <Forgot />}
      {mode === 'reset' && <Reset token={token} />}
    </QueryProvider>
  );
}
