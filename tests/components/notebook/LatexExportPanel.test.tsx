import { fireEvent, render, screen } from '@testing-library/react-native';
import { LatexExportPanel } from '../../../components/notebook/LatexExportPanel';
import { latexExportQuery } from '../../../shared/api/schemas';

describe('LatexExportPanel', () => {
  test('by default every digit with fractions; the choices reach the export query, which the API schema accepts', () => {
    const onExport = jest.fn();
    render(<LatexExportPanel displayDigits={12} busy={false} onExport={onExport} />);
    fireEvent.press(screen.getByTestId('export-tex-download'));
    expect(onExport).toHaveBeenLastCalledWith({ exact: 'true' });

    fireEvent.press(screen.getByTestId('export-tex-rounded'));
    fireEvent.press(screen.getByTestId('export-tex-exact'));
    fireEvent.press(screen.getByTestId('export-tex-download'));
    expect(onExport).toHaveBeenLastCalledWith({ digits: 12, exact: 'false' });
    // The query as the server reads it (strings in a URL): the same schema validates both sides.
    expect(latexExportQuery.parse({ digits: '12', exact: 'false' })).toEqual({ digits: 12, exact: 'false' });
  });
});
