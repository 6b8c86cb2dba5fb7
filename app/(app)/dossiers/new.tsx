import { useRouter } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { NEW_PRODUCT, ProductPicker } from '../../../components/product-picker';
import { RequirementEditor } from '../../../components/requirement-editor';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Message } from '../../../components/ui/message';
import { Screen } from '../../../components/ui/screen';
import { TextFields, type TextFieldSpec } from '../../../components/ui/text-fields';
import { space, type } from '../../../constants/theme';
import type { RequirementDraft } from '../../../shared/schema/discharge';
import { dossierCreateSchema, productCreateSchema } from '../../../shared/schema/workflow';
import { ApiError, type FieldError } from '../../../hooks/api';
import { useCreateDossier, useCreateProduct, useProducts } from '../../../hooks/use-dossiers';

// The limit is the user's to enter: nothing is filled in until they type it or pick a preset.
const EMPTY_REQUIREMENT: RequirementDraft = { safeVoltage: null, maxTime: null, condition: '', reference: '' };

const PRODUCT_FIELDS: ReadonlyArray<TextFieldSpec<'name' | 'modelNumber' | 'description'>> = [
  { key: 'name', label: 'Product name', testID: 'product-name' },
  { key: 'modelNumber', label: 'Model number', testID: 'product-model' },
  { key: 'description', label: 'Description', testID: 'product-description' },
];
const DOSSIER_FIELDS: ReadonlyArray<TextFieldSpec<'title'>> = [
  { key: 'title', label: 'Title', testID: 'dossier-title', placeholder: 'e.g. DC-link residual voltage at service access' },
];

interface Form {
  productChoice: string;
  product: { name: string; modelNumber: string; description: string };
  title: string;
  requirement: RequirementDraft;
}

/** What the form says is missing or wrong, checked with the server's own schemas. */
function problemsOf(form: Form): FieldError[] {
  const problems: FieldError[] = [];
  if (!form.productChoice) problems.push({ path: 'productId', message: 'Choose a product or add a new one.' });
  if (form.productChoice === NEW_PRODUCT) {
    const p = productCreateSchema.safeParse(form.product);
    if (!p.success) problems.push(...p.error.issues.map((i) => ({ path: `product.${i.path.join('.')}`, message: i.message })));
  }
  const r = dossierCreateSchema.safeParse({ productId: 1, title: form.title, requirement: form.requirement });
  if (!r.success)
    problems.push(...r.error.issues.filter((i) => i.path[0] !== 'productId').map((i) => ({ path: i.path.join('.'), message: i.message })));
  return problems;
}

export default function NewDossierScreen() {
  const router = useRouter();
  const products = useProducts();
  const createProduct = useCreateProduct();
  const createDossier = useCreateDossier();
  const [form, setForm] = useState<Form>({
    productChoice: '',
    product: { name: '', modelNumber: '', description: '' },
    title: '',
    requirement: EMPTY_REQUIREMENT,
  });
  // After the first attempt the form re-checks as it is edited, so a message leaves once it is answered.
  const [attempted, setAttempted] = useState(false);
  const [serverErrors, setServerErrors] = useState<FieldError[]>([]);
  const errors = [...(attempted ? problemsOf(form) : []), ...serverErrors];

  const edit = (patch: Partial<Form>) => {
    setServerErrors([]);
    setForm((f) => ({ ...f, ...patch }));
  };
  const errorAt = (path: string) => errors.find((e) => e.path === path)?.message;
  const busy = createProduct.isPending || createDossier.isPending;
  const cancel = () => (router.canGoBack() ? router.back() : router.replace('/dossiers'));

  async function submit() {
    setAttempted(true);
    setServerErrors([]);
    if (problemsOf(form).length) return;
    try {
      const productId =
        form.productChoice === NEW_PRODUCT
          ? (await createProduct.mutateAsync(productCreateSchema.parse(form.product))).id
          : Number(form.productChoice);
      const dossier = await createDossier.mutateAsync(dossierCreateSchema.parse({ productId, title: form.title, requirement: form.requirement }));
      router.replace(`/revisions/${dossier.revisions[0].id}`);
    } catch (err) {
      if (err instanceof ApiError) setServerErrors(err.fields.length ? err.fields : [{ path: '', message: err.message }]);
    }
  }

  const general = errors.find((e) => e.path === '');
  return (
    <Screen
      title="New dossier"
      subtitle="What must be proven, for which product."
      testID="new-dossier-screen"
      actions={<Button label="Cancel" variant="quiet" testID="new-dossier-cancel" onPress={cancel} />}
    >
      <Card title="Product">
        {products.isError ? <Message tone="error" text={products.error.message} /> : null}
        <ProductPicker
          products={products.data ?? []}
          value={form.productChoice}
          onChange={(productChoice) => edit({ productChoice })}
          testID="dossier-product"
        />
        {errorAt('productId') ? <Message tone="error" text={errorAt('productId')!} testID="dossier-product-error" /> : null}
        {form.productChoice === NEW_PRODUCT ? (
          <TextFields
            fields={PRODUCT_FIELDS}
            value={form.product}
            onChange={(product) => edit({ product })}
            errorOf={(key) => errorAt(`product.${key}`)}
          />
        ) : null}
      </Card>
      <Card title="Dossier">
        <TextFields fields={DOSSIER_FIELDS} value={form} onChange={({ title }) => edit({ title })} errorOf={errorAt} />
      </Card>
      <Text style={type.small}>
        The limit is yours to enter from the edition of the standard you work to; the typical requirements are starting points to verify.
      </Text>
      <RequirementEditor
        value={form.requirement}
        onChange={(requirement) => edit({ requirement })}
        testIDPrefix="dossier-req"
        serverErrors={errors}
        presetsOpen
      />
      {general ? <Message tone="error" text={general.message} /> : null}
      {errors.length && !general ? <Message tone="error" text="Some fields need attention (marked above)." testID="new-dossier-errors" /> : null}
      <View style={styles.actions}>
        <Button label="Create dossier and start revision 1" testID="create-dossier" onPress={submit} busy={busy} />
        <Button label="Cancel" variant="secondary" testID="new-dossier-cancel-bottom" onPress={cancel} disabled={busy} />
      </View>
    </Screen>
  );
}

const styles = StyleSheet.create({
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm },
});
