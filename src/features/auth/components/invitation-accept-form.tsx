import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import { InvitationAcceptSchema, type InvitationPreview, type Session } from '@shared/schemas/auth';
import { Alert } from '@/components/alert';
import { Button } from '@/components/button';
import { Field } from '@/components/field';
import { applyRequestError } from '@/lib/form-errors';
import { ROLE_LABELS } from '@/lib/roles';
import { useAcceptInvitation } from '../data/accept-invitation';

const NEEDS_NETWORK = 'Accepting an invitation needs a network connection. Connect and try again.';

export function InvitationAcceptForm({
  token,
  preview,
  onAccepted,
}: {
  token: string;
  preview: InvitationPreview;
  onAccepted: (session: Session) => void;
}) {
  const accept = useAcceptInvitation();
  const [formError, setFormError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    setError,
    formState: { errors },
  } = useForm({ resolver: zodResolver(InvitationAcceptSchema), defaultValues: { name: '', password: '' } });

  const onSubmit = handleSubmit((values) => {
    setFormError(null);
    accept.mutate(
      { token, ...values },
      {
        onSuccess: onAccepted,
        onError: (error) => setFormError(applyRequestError(error, setError, ['name', 'password'], { offlineMessage: NEEDS_NETWORK })),
      },
    );
  });

  const expires = new Date(preview.expiresAt);
  return (
    <div className="flex flex-col gap-4">
      <dl className="grid grid-cols-[auto_1fr] gap-x-4 gap-y-1 rounded-lg bg-surface-sunken p-4">
        <dt className="font-bold">Organisation</dt>
        <dd>{preview.organisationName}</dd>
        <dt className="font-bold">Role</dt>
        <dd>{ROLE_LABELS[preview.role]}</dd>
        <dt className="font-bold">E-mail</dt>
        <dd className="break-all">{preview.email}</dd>
        <dt className="font-bold">Expires</dt>
        <dd>{Number.isNaN(expires.getTime()) ? preview.expiresAt : expires.toLocaleString()}</dd>
      </dl>
      <form onSubmit={onSubmit} noValidate className="flex flex-col gap-4" aria-label="Accept the invitation">
        {preview.hasAccount && (
          <Alert tone="info">This e-mail address already has a Fringewalk account: enter its password to join.</Alert>
        )}
        <Field label="Your name" autoComplete="name" error={errors.name?.message} {...register('name')} />
        <Field
          label={preview.hasAccount ? 'Your password' : 'Choose a password'}
          type="password"
          autoComplete={preview.hasAccount ? 'current-password' : 'new-password'}
          hint={preview.hasAccount ? undefined : 'At least 10 characters.'}
          error={errors.password?.message}
          {...register('password')}
        />
        {formError && (
          <Alert tone="danger" title="Not accepted">
            {formError}
          </Alert>
        )}
        <Button type="submit" busy={accept.isPending} busyLabel="Joining…">
          Accept and join
        </Button>
      </form>
    </div>
  );
}
