import { useEffect, useState } from 'react';
import { StyleSheet, Text, View } from 'react-native';
import { space, type } from '../constants/theme';
import type { DossierListFilter } from '../shared/schema/lists';
import { revisionStatuses, STATUS_WORDS, type RevisionStatus } from '../shared/schema/workflow';
import type { Product } from '../hooks/types';
import { ProductPicker } from './product-picker';
import { Button } from './ui/button';
import { Card } from './ui/card';
import { Choice } from './ui/choice';
import { TextField } from './ui/text-field';

/** How long typing may pause before the list is asked again: one request per pause, not per key. */
const SETTLE_MS = 300;

const ANY = 'any';
type StatusChoice = RevisionStatus | typeof ANY;

interface Props {
  products: readonly Product[];
  /** A viewer sees approved revisions only: a status filter would offer them nothing. */
  withStatus: boolean;
  onChange: (filter: DossierListFilter) => void;
}

/** Words for the filters in force, e.g. "Showing DC-link 7 (DL-7) with the latest revision awaiting review."; null when none is. */
function describe(products: readonly Product[], productId: string, status: StatusChoice): string | null {
  const product = products.find((p) => String(p.id) === productId);
  if (!product && status === ANY) return null;
  const which = product ? `${product.name} (${product.modelNumber})` : 'dossiers';
  const state = status === ANY ? '' : ` with the latest revision ${STATUS_WORDS[status].toLowerCase()}`;
  return `Showing ${which}${state}.`;
}

/**
 * Finding a dossier among many: a search over title, product, model number and reference, and filters by
 * product and by the latest revision's status. The server does the matching; this only says what to ask.
 */
export function DossierFilter({ products, withStatus, onChange }: Props) {
  const [text, setText] = useState('');
  const [productId, setProductId] = useState('');
  const [status, setStatus] = useState<StatusChoice>(ANY);
  const [open, setOpen] = useState(false);

  useEffect(() => {
    const timer = setTimeout(
      () =>
        onChange({
          q: text.trim() || undefined,
          productId: productId ? Number(productId) : undefined,
          status: status === ANY ? undefined : status,
        }),
      SETTLE_MS,
    );
    return () => clearTimeout(timer);
  }, [text, productId, status, onChange]);

  const inForce = describe(products, productId, status);
  const clear = () => {
    setProductId('');
    setStatus(ANY);
  };

  return (
    <Card testID="dossier-filter">
      <View style={styles.row}>
        <TextField
          label="Search"
          testID="dossier-search"
          placeholder="Search dossiers"
          hint="Title, product, model number or the requirement’s reference"
          value={text}
          onChangeText={setText}
          autoCapitalize="none"
          autoCorrect={false}
          inputMode="search"
        />
      </View>
      <View style={styles.actions}>
        <Button
          label={open ? 'Hide filters' : 'Filter by product or status'}
          variant="secondary"
          testID="dossier-filter-toggle"
          onPress={() => setOpen((o) => !o)}
        />
        {inForce ? <Button label="Clear filters" variant="quiet" testID="dossier-filter-clear" onPress={clear} /> : null}
      </View>
      {inForce ? (
        <Text style={type.small} testID="dossier-filter-summary">
          {inForce}
        </Text>
      ) : null}
      {open ? (
        <View style={styles.filters}>
          <ProductPicker products={products} value={productId} onChange={setProductId} testID="dossier-filter-product" mode="filter" />
          {withStatus ? (
            <Choice
              label="Latest revision"
              testID="dossier-filter-status"
              options={[{ value: ANY, label: 'Any status' }, ...revisionStatuses.map((s) => ({ value: s, label: STATUS_WORDS[s] }))]}
              value={status}
              onChange={setStatus}
            />
          ) : null}
        </View>
      ) : null}
    </Card>
  );
}

const styles = StyleSheet.create({
  // A row so the text field's own flex basis sizes its width, not its height.
  row: { flexDirection: 'row' },
  actions: { flexDirection: 'row', flexWrap: 'wrap', gap: space.sm, alignItems: 'center' },
  filters: { gap: space.lg },
});
