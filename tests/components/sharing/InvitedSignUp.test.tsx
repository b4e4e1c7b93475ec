import { screen } from '@testing-library/react-native';
import { SignUpForm } from '../../../components/auth/SignUpForm';
import { renderWithQueryClient } from '../testUtils';

jest.mock('expo-router', () => ({ Link: ({ children }: { children: unknown }) => children }));

describe('sign-up from an invitation', () => {
  it('fills in the invited address and says the notebook opens once it is confirmed', () => {
    renderWithQueryClient(<SignUpForm initialEmail="invited@y.example" invited />);
    expect(screen.getByTestId('sign-up-email').props.value).toBe('invited@y.example');
    expect(screen.getByTestId('sign-up-invited')).toHaveTextContent('You were invited to a notebook; it opens for you once you confirm this address');
  });

  it('says nothing about invitations on an ordinary sign-up', () => {
    renderWithQueryClient(<SignUpForm />);
    expect(screen.getByTestId('sign-up-email').props.value).toBe('');
    expect(screen.queryByTestId('sign-up-invited')).toBeNull();
  });
});
