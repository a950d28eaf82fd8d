import { zodResolver } from '@hookform/resolvers/zod';
import {
  assignBadgeRequestSchema,
  createPersonRequestSchema,
  pinSchema,
  passwordSchema,
  ROLES,
  updatePersonRequestSchema,
  type Person,
} from '@tareline/protocol';
import { useState, type FormEvent } from 'react';
import { useForm, type FieldValues, type Path, type UseFormReturn } from 'react-hook-form';
import type { z } from 'zod';
import { ApiRequestError } from '../../../lib/api-client';
import {
  useAssignBadge,
  useCreatePerson,
  usePeople,
  useSetPassword,
  useSetPin,
  useUpdatePerson,
} from '../api/people';
import { useCodeScanner } from '../../../hooks/use-code-scanner';
import { SelectField, TextField } from '../../../components/form/field';

const button = 'min-h-11 rounded-lg px-4 font-semibold';
const primary = `${button} bg-steel text-paper`;
const secondary = `${button} border-2 border-line bg-panel`;
const ROLE_OPTIONS = ROLES.map((role) => ({ value: role, label: role }));

/** Puts the hub's field errors on the form's fields; anything else becomes the form's message. */
function showServerError<T extends FieldValues>(form: UseFormReturn<T>, error: unknown): void {
  if (error instanceof ApiRequestError) {
    const fields = error.body.errors.filter((e) => e.path !== '(body)');
    for (const e of fields) form.setError(e.path as Path<T>, { message: e.message });
    if (fields.length === 0) form.setError('root' as Path<T>, { message: error.message });
  } else {
    form.setError('root' as Path<T>, { message: 'The hub cannot be reached' });
  }
}

/** People, roles, badges, PINs and passwords, for admins. */
export function PeoplePage() {
  const people = usePeople();
  const [adding, setAdding] = useState(false);
  const [selectedId, setSelectedId] = useState<string | null>(null);
  const selected = people.data?.find((p) => p.id === selectedId);

  return (
    <section aria-labelledby="people-title" className="mx-auto flex max-w-5xl flex-col gap-6">
      <div className="flex items-center justify-between">
        <h1 id="people-title" className="text-3xl font-bold">
          People
        </h1>
        <button type="button" className={primary} onClick={() => setAdding(true)}>
          Add person
        </button>
      </div>
      {people.isPending && <p>Loading people…</p>}
      {people.error && <p role="alert">Could not load people: {people.error.message}</p>}
      {adding && <AddPersonForm onDone={() => setAdding(false)} />}
      {people.data && (
        <table className="w-full border-collapse bg-panel text-left">
          <thead>
            <tr className="border-b-2 border-line">
              <th className="p-2">Name</th>
              <th className="p-2">Role</th>
              <th className="p-2">E-mail</th>
              <th className="p-2">Badge</th>
              <th className="p-2">PIN</th>
              <th className="p-2">Status</th>
              <th className="p-2">
                <span className="sr-only">Actions</span>
              </th>
            </tr>
          </thead>
          <tbody>
            {people.data.map((p) => (
              <tr key={p.id} className="border-b border-line">
                <td className="p-2 font-semibold">{p.name}</td>
                <td className="p-2">{p.role}</td>
                <td className="p-2">{p.email ?? '—'}</td>
                <td className="p-2">{p.hasBadge ? 'yes' : 'none'}</td>
                <td className="p-2">{p.hasPin ? 'set' : 'none'}</td>
                <td className="p-2">{p.active ? 'active' : 'deactivated'}</td>
                <td className="p-2">
                  <button
                    type="button"
                    className={secondary}
                    aria-label={`Manage ${p.name}`}
                    onClick={() => setSelectedId(p.id)}
                  >
                    Manage
                  </button>
                </td>
              </tr>
            ))}
          </tbody>
        </table>
      )}
      {selected && (
        <ManagePerson key={selected.id} person={selected} onClose={() => setSelectedId(null)} />
      )}
    </section>
  );
}

type CreateInput = z.input<typeof createPersonRequestSchema>;
type CreateOutput = z.output<typeof createPersonRequestSchema>;

function AddPersonForm({ onDone }: { onDone: () => void }) {
  const create = useCreatePerson();
  const form = useForm<CreateInput, unknown, CreateOutput>({
    resolver: zodResolver(createPersonRequestSchema),
    defaultValues: { name: '', role: 'operator', email: '', password: '', badge: '', pin: '' },
  });
  const { errors } = form.formState;
  const submit = form.handleSubmit(async (values) => {
    try {
      await create.mutateAsync(values);
      onDone();
    } catch (error) {
      showServerError(form, error);
    }
  });
  return (
    <form
      noValidate
      aria-label="Add person"
      onSubmit={submit}
      className="grid grid-cols-1 gap-4 rounded-xl bg-panel p-5 shadow-sm md:grid-cols-2"
    >
      <h2 className="text-2xl font-bold md:col-span-2">Add person</h2>
      {errors.root && (
        <p role="alert" className="font-semibold text-over md:col-span-2">
          {errors.root.message}
        </p>
      )}
      <TextField label="Name" error={errors.name?.message} {...form.register('name')} />
      <SelectField
        label="Role"
        size="form"
        error={errors.role?.message}
        options={ROLE_OPTIONS}
        {...form.register('role')}
      />
      <TextField
        label="E-mail (leads and admins)"
        error={errors.email?.message}
        type="email"
        {...form.register('email')}
      />
      <TextField
        label="Password (leads and admins)"
        error={errors.password?.message}
        type="password"
        autoComplete="new-password"
        {...form.register('password')}
      />
      <TextField
        label="Badge code"
        error={errors.badge?.message}
        autoComplete="off"
        {...form.register('badge')}
      />
      <TextField
        label="PIN (optional, 4 to 8 digits)"
        error={errors.pin?.message}
        inputMode="numeric"
        autoComplete="off"
        {...form.register('pin')}
      />
      <div className="flex gap-3 md:col-span-2">
        <button type="submit" className={primary} disabled={create.isPending}>
          Save person
        </button>
        <button type="button" className={secondary} onClick={onDone}>
          Cancel
        </button>
      </div>
    </form>
  );
}

type UpdateInput = z.input<typeof updatePersonRequestSchema>;
type UpdateOutput = z.output<typeof updatePersonRequestSchema>;

function ManagePerson({ person, onClose }: { person: Person; onClose: () => void }) {
  const update = useUpdatePerson();
  const [notice, setNotice] = useState<string | null>(null);
  const form = useForm<UpdateInput, unknown, UpdateOutput>({
    resolver: zodResolver(updatePersonRequestSchema),
    defaultValues: { name: person.name, email: person.email ?? '', role: person.role },
  });
  const { errors } = form.formState;
  const save = form.handleSubmit(async (values) => {
    try {
      await update.mutateAsync({ id: person.id, ...values });
      setNotice('Saved');
    } catch (error) {
      showServerError(form, error);
    }
  });
  const toggleActive = async () => {
    try {
      await update.mutateAsync({ id: person.id, active: !person.active });
      setNotice(person.active ? `${person.name} is deactivated` : `${person.name} is active again`);
    } catch (error) {
      showServerError(form, error);
    }
  };

  return (
    <section
      aria-label={`Manage ${person.name}`}
      className="flex flex-col gap-6 rounded-xl bg-panel p-5 shadow-sm"
    >
      <div className="flex items-center justify-between">
        <h2 className="text-2xl font-bold">{person.name}</h2>
        <button type="button" className={secondary} onClick={onClose}>
          Close
        </button>
      </div>
      {notice && <p role="status">{notice}</p>}
      <form
        noValidate
        aria-label="Edit person"
        onSubmit={save}
        className="grid grid-cols-1 gap-4 md:grid-cols-3"
      >
        {errors.root && (
          <p role="alert" className="font-semibold text-over md:col-span-3">
            {errors.root.message}
          </p>
        )}
        <TextField label="Name" error={errors.name?.message} {...form.register('name')} />
        <TextField
          label="E-mail"
          error={errors.email?.message}
          type="email"
          {...form.register('email')}
        />
        <SelectField
          label="Role"
          size="form"
          error={errors.role?.message}
          options={ROLE_OPTIONS}
          {...form.register('role')}
        />
        <div className="flex gap-3 md:col-span-3">
          <button type="submit" className={primary} disabled={update.isPending}>
            Save changes
          </button>
          <button type="button" className={secondary} onClick={() => void toggleActive()}>
            {person.active ? 'Deactivate' : 'Reactivate'}
          </button>
        </div>
      </form>
      <div className="grid grid-cols-1 gap-6 md:grid-cols-3">
        <AssignBadge person={person} onDone={setNotice} />
        <SecretReset person={person} kind="pin" onDone={setNotice} />
        <SecretReset person={person} kind="password" onDone={setNotice} />
      </div>
    </section>
  );
}

/** Waits for a badge scan (or a typed code) and gives the badge to the person. */
function AssignBadge({ person, onDone }: { person: Person; onDone: (m: string) => void }) {
  const assign = useAssignBadge();
  const [waiting, setWaiting] = useState(false);
  const [typed, setTyped] = useState('');
  const [error, setError] = useState<string | null>(null);
  const give = async (code: string) => {
    const parsed = assignBadgeRequestSchema.safeParse({ badge: code });
    if (!parsed.success) {
      setError(parsed.error.issues[0]?.message ?? 'Not a badge code');
      return;
    }
    try {
      await assign.mutateAsync({ id: person.id, ...parsed.data });
      setWaiting(false);
      setTyped('');
      setError(null);
      onDone(`Badge assigned to ${person.name}`);
    } catch (e) {
      setError(e instanceof ApiRequestError ? e.message : 'The hub cannot be reached');
    }
  };
  useCodeScanner((code) => void give(code), { enabled: waiting });
  return (
    <div className="flex flex-col gap-2">
      <h3 className="text-lg font-bold">Badge</h3>
      {waiting ? (
        <>
          <p role="status" className="font-semibold">
            Scan the badge now, or type its code:
          </p>
          <form
            className="flex gap-2"
            onSubmit={(e: FormEvent) => {
              e.preventDefault();
              void give(typed);
            }}
          >
            <TextField
              label="Badge code to assign"
              hideLabel
              autoComplete="off"
              value={typed}
              onChange={(e) => setTyped(e.target.value)}
            />
            <button type="submit" className={primary}>
              Assign
            </button>
          </form>
          <button type="button" className={secondary} onClick={() => setWaiting(false)}>
            Cancel
          </button>
        </>
      ) : (
        <button type="button" className={secondary} onClick={() => setWaiting(true)}>
          {person.hasBadge ? 'Replace badge' : 'Assign badge'}
        </button>
      )}
      {error && (
        <p role="alert" className="font-semibold text-over">
          {error}
        </p>
      )}
    </div>
  );
}

/** Sets a new PIN (or removes it) or a new password. */
function SecretReset({
  person,
  kind,
  onDone,
}: {
  person: Person;
  kind: 'pin' | 'password';
  onDone: (m: string) => void;
}) {
  const setPin = useSetPin();
  const setPassword = useSetPassword();
  const [value, setValue] = useState('');
  const [error, setError] = useState<string | null>(null);
  const label = kind === 'pin' ? 'New PIN' : 'New password';
  const save = async (remove = false) => {
    const schema = kind === 'pin' ? pinSchema : passwordSchema;
    const parsed = remove ? { success: true as const, data: null } : schema.safeParse(value);
    if (!parsed.success) {
      setError(parsed.error.issues[0]?.message ?? 'Not valid');
      return;
    }
    try {
      if (kind === 'pin') await setPin.mutateAsync({ id: person.id, pin: parsed.data });
      else await setPassword.mutateAsync({ id: person.id, password: parsed.data! });
      setValue('');
      setError(null);
      onDone(
        remove
          ? `PIN removed for ${person.name}`
          : `${kind === 'pin' ? 'PIN' : 'Password'} set for ${person.name}`,
      );
    } catch (e) {
      setError(e instanceof ApiRequestError ? e.message : 'The hub cannot be reached');
    }
  };
  return (
    <form
      noValidate
      className="flex flex-col gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        void save();
      }}
    >
      <TextField
        label={label}
        error={error ?? undefined}
        type="password"
        autoComplete="new-password"
        inputMode={kind === 'pin' ? 'numeric' : undefined}
        value={value}
        onChange={(e) => setValue(e.target.value)}
      />
      <div className="flex gap-2">
        <button type="submit" className={primary}>
          {kind === 'pin' ? 'Set PIN' : 'Set password'}
        </button>
        {kind === 'pin' && person.hasPin && (
          <button type="button" className={secondary} onClick={() => void save(true)}>
            Remove PIN
          </button>
        )}
      </div>
    </form>
  );
}
