import { useMemo, useState } from 'react';
import { Pressable, StyleSheet, Text, View } from 'react-native';
import { colors, fonts, radius, space, type } from '../constants/theme';
import type { Product } from '../hooks/types';
import { TextField } from './ui/text-field';

/** The value that stands for "a product not in the list yet". */
export const NEW_PRODUCT = 'new';

/** How many matches are listed at once; more are reached by typing, not by scrolling a long list. */
const SHOWN = 8;

interface Props {
  products: readonly Product[];
  /** A product id as text, NEW_PRODUCT, or '' while none is chosen. */
  value: string;
  onChange: (value: string) => void;
  testID: string;
  /**
   * `choose` (default) ends the list with "+ New product"; `filter` starts it with "All products" (the
   * value '') and offers no new product, for narrowing a list rather than filling in a form.
   */
  mode?: 'choose' | 'filter';
}

/** The option that stands for "no product filter". */
const ALL_PRODUCTS = 'all';

function matches(product: Product, words: string[]): boolean {
  const haystack = `${product.name} ${product.modelNumber}`.toLowerCase();
  return words.every((w) => haystack.includes(w));
}

/** Picks the equipment under assessment from any number of products: type a few letters of the name or model number. */
export function ProductPicker({ products, value, onChange, testID, mode = 'choose' }: Props) {
  const [query, setQuery] = useState('');
  const found = useMemo(() => {
    const words = query.toLowerCase().split(/\s+/).filter(Boolean);
    return [...products].filter((p) => matches(p, words)).sort((a, b) => a.name.localeCompare(b.name));
  }, [products, query]);
  const chosen = products.find((p) => String(p.id) === value);
  // The chosen product stays in view even when the search no longer matches it.
  const listed = [...(chosen && !found.slice(0, SHOWN).includes(chosen) ? [chosen] : []), ...found.slice(0, SHOWN)];

  const option = (key: string, title: string, detail: string | null) => {
    const selected = key === value || (key === ALL_PRODUCTS && value === '');
    return (
      <Pressable
        key={key}
        testID={`${testID}-${key}`}
        accessibilityRole="radio"
        accessibilityState={{ checked: selected }}
        onPress={() => onChange(key === ALL_PRODUCTS ? '' : key)}
        style={[styles.option, selected && styles.selected]}
      >
        <Text style={[styles.title, selected && styles.titleSelected]}>
          {selected ? '● ' : '○ '}
          {title}
        </Text>
        {detail ? <Text style={type.small}>{detail}</Text> : null}
      </Pressable>
    );
  };

  return (
    <View
      style={styles.wrap}
      accessibilityRole="radiogroup"
      accessibilityLabel={mode === 'filter' ? 'Product' : 'Equipment under assessment'}
      testID={testID}
    >
      <View style={styles.row}>
        <TextField
          label="Search products"
          testID={`${testID}-search`}
          placeholder="Name or model number"
          value={query}
          onChangeText={setQuery}
          autoCapitalize="none"
          autoCorrect={false}
        />
      </View>
      <Text style={type.small} testID={`${testID}-count`}>
        {products.length === 0
          ? mode === 'filter'
            ? 'No products yet.'
            : 'No products yet: add the first one.'
          : found.length === 0
            ? `No product matches “${query.trim()}”.`
            : found.length > SHOWN
              ? query.trim()
                ? `${found.length} products match; the first ${SHOWN} by name are listed. Type more of the name or model number to narrow them.`
                : `${found.length} products; the first ${SHOWN} by name are listed. Type part of a name or model number to find the others.`
              : `${found.length} of ${products.length} product${products.length === 1 ? '' : 's'}.`}
      </Text>
      <View style={styles.list}>
        {mode === 'filter' ? option(ALL_PRODUCTS, 'All products', null) : null}
        {listed.map((p) => option(String(p.id), p.name, `Model ${p.modelNumber}`))}
        {mode === 'choose' ? option(NEW_PRODUCT, '+ New product', 'Not in the list: enter its name and model number') : null}
      </View>
    </View>
  );
}

const styles = StyleSheet.create({
  wrap: { gap: space.sm },
  // A row so the text field's own flex basis sizes its width, not its height.
  row: { flexDirection: 'row' },
  list: { gap: space.xs },
  option: {
    minHeight: 44,
    paddingHorizontal: space.md,
    paddingVertical: space.sm,
    gap: 2,
    justifyContent: 'center',
    borderRadius: radius.md,
    borderWidth: 1,
    borderColor: colors.line,
    backgroundColor: colors.surface,
  },
  selected: { borderColor: colors.brand, backgroundColor: colors.brandSoft },
  title: { fontFamily: fonts.medium, fontSize: 15, color: colors.ink },
  titleSelected: { fontFamily: fonts.semibold, color: colors.brand },
});
