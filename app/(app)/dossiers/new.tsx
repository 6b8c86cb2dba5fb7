import { useRouter } from 'expo-router';
import { useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { RequirementEditor } from '../../../components/requirement-editor';
import { Button } from '../../../components/ui/button';
import { Card } from '../../../components/ui/card';
import { Choice } from '../../../components/ui/choice';
import { Message } from '../../../components/ui/message';
import { Screen } from '../../../components/ui/screen';
import { TextField } from '../../../components/ui/text-field';
import { space, type } from '../../../constants/theme';
import type { RequirementDraft } from '../../../shared/schema/discharge';
import { dossierCreateSchema, productCreateSchema } from '../../../shared/schema/workflow';
import { ApiError, type FieldError } from '../../../hooks/api';
import { useCreateDossier, useCreateProduct, useProducts } from '../../../hooks/use-dossiers';

const NEW_PRODUCT = 'new';

export default function NewDossierScreen() {
  const router = useRouter();
  const products = useProducts();
  const createProduct = useCreateProduct();
  const createDossier = useCreateDossier();
  const [productChoice, setProductChoice] = useState<string>('');
  const [product, setProduct] = useState({ name: '', modelNumber: '', description: '' });
  const [title, setTitle] = useState('');
  const [requirement, setRequirement] = useState<RequirementDraft>({ safeVoltage: 60, maxTime: 5, condition: '', reference: '' });
  const [errors, setErrors] = useState<FieldError[]>([]);

  const errorAt = (path: string) => errors.find((e) => e.path === path)?.message;
  const busy = createProduct.isPending || createDossier.isPending;

  async function submit() {
    setErrors([]);
    const local: FieldError[] = [];
    if (!productChoice) local.push({ path: 'productId', message: 'Choose a product or add a new one.' });
    if (productChoice === NEW_PRODUCT) {
      const p = productCreateSchema.safeParse(product);
      if (!p.success) local.push(...p.error.issues.map((i) => ({ path: `product.${i.path.join('.')}`, message: i.message })));
    }
    const r = dossierCreateSchema.safeParse({ productId: 1, title, requirement });
    if (!r.success) local.push(...r.error.issues.filter((i) => i.path[0] !== 'productId').map((i) => ({ path: i.path.join('.'), message: i.message })));
    if (local.length) return setErrors(local);
    try {
      const productId = productChoice === NEW_PRODUCT ? (await createProduct.mutateAsync(productCreateSchema.parse(product))).id : Number(productChoice);
      const dossier = await createDossier.mutateAsync(dossierCreateSchema.parse({ productId, title, requirement }));
      router.replace(`/revisions/${dossier.revisions[0].id}`);
    } catch (err) {
      if (err instanceof ApiError) setErrors(err.fields.length ? err.fields : [{ path: '', message: err.message }]);
    }
  }

  const options = [...(products.data ?? []).map((p) => ({ value: String(p.id), label: `${p.name} (${p.modelNumber})` })), { value: NEW_PRODUCT, label: '+ New product' }];

  return (
    <Screen title="New dossier" subtitle="What must be proven, for which product." testID="new-dossier-screen">
      <Card title="Product">
        <Choice label="Equipment under assessment" testID="dossier-product" options={options} value={productChoice} onChange={setProductChoice} />
        {errorAt('productId') ? <Message tone="error" text={errorAt('productId')!} /> : null}
        {productChoice === NEW_PRODUCT ? (
          <View style={styles.row}>
            <TextField label="Product name" testID="product-name" value={product.name} onChangeText={(name) => setProduct({ ...product, name })} error={errorAt('product.name')} />
            <TextField label="Model number" testID="product-model" value={product.modelNumber} onChangeText={(modelNumber) => setProduct({ ...product, modelNumber })} error={errorAt('product.modelNumber')} />
            <TextField label="Description" testID="product-description" value={product.description} onChangeText={(description) => setProduct({ ...product, description })} />
          </View>
        ) : null}
      </Card>
      <Card title="Dossier">
        <TextField label="Title" testID="dossier-title" placeholder="e.g. DC-link residual voltage at service access" value={title} onChangeText={setTitle} error={errorAt('title')} />
      </Card>
      <Text style={type.small}>The limit is yours to enter from the edition of the standard you work to; presets are starting points only.</Text>
      <RequirementEditor value={requirement} onChange={setRequirement} testIDPrefix="dossier-req" serverErrors={errors} />
      {errors.find((e) => e.path === '') ? <Message tone="error" text={errors.find((e) => e.path === '')!.message} /> : null}
      {errors.length && !errors.find((e) => e.path === '') ? <Message tone="error" text="Some fields need attention (marked above)." testID="new-dossier-errors" /> : null}
      <View style={styles.actions}>
        <Button label="Create dossier and start revision 1" testID="create-dossier" onPress={submit} busy={busy} />
      </View>
    </Screen>
  );
}

const styles = StyleSheet.create({
  row: { flexDirection: 'row', flexWrap: 'wrap', gap: space.md },
  actions: { alignSelf: 'flex-start' },
});
