import type { ComponentProps } from 'react';
import { Controller, type Control, type FieldValues, type Path } from 'react-hook-form';
import { TextField } from './text-field';

type Props<T extends FieldValues> = Omit<ComponentProps<typeof TextField>, 'value' | 'onChangeText' | 'onBlur'> & {
  control: Control<T>;
  name: Path<T>;
};

/** A text field bound to one string of a react-hook-form form. */
export function FormTextField<T extends FieldValues>({ control, name, ...field }: Props<T>) {
  return (
    <Controller
      control={control}
      name={name}
      render={({ field: bound }) => <TextField {...field} value={bound.value} onChangeText={bound.onChange} onBlur={bound.onBlur} />}
    />
  );
}
