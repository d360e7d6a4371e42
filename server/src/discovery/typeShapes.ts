// What the written types say, read syntactically (no type checker): the length of a
// tuple parameter, a Float64Array parameter, and the keys of a declared return object.
// Type aliases and interfaces of the same file are followed; JSDoc types count in .js files.
import * as ts from 'typescript';
import type { FunctionNode } from './exports';

export type TypeDeclarations = Map<string, ts.TypeAliasDeclaration | ts.InterfaceDeclaration>;

export function collectTypeDeclarations(sourceFile: ts.SourceFile): TypeDeclarations {
  const declarations: TypeDeclarations = new Map();
  for (const statement of sourceFile.statements) {
    if ((ts.isTypeAliasDeclaration(statement) || ts.isInterfaceDeclaration(statement)) && !declarations.has(statement.name.text)) {
      declarations.set(statement.name.text, statement);
    }
  }
  return declarations;
}

export function firstParameterType(fn: FunctionNode): ts.TypeNode | undefined {
  const parameter = fn.parameters[0];
  return parameter ? parameter.type ?? ts.getJSDocType(parameter) : undefined;
}

export function returnType(fn: FunctionNode): ts.TypeNode | undefined {
  return fn.type ?? ts.getJSDocReturnType(fn);
}

// Aliases may refer to aliases; a bound stops a cycle like `type A = B; type B = A`.
const maxAliasDepth = 16;

/** The type with `readonly`, `Readonly<…>`, parentheses and same-file aliases peeled off. */
export function resolveType(type: ts.TypeNode | undefined, declarations: TypeDeclarations): ts.TypeNode | ts.InterfaceDeclaration | undefined {
  let current: ts.TypeNode | undefined = type;
  for (let depth = 0; current && depth < maxAliasDepth; depth++) {
    if (ts.isParenthesizedTypeNode(current)) current = current.type;
    else if (ts.isTypeOperatorNode(current) && current.operator === ts.SyntaxKind.ReadonlyKeyword) current = current.type;
    else if (ts.isTypeReferenceNode(current) && ts.isIdentifier(current.typeName)) {
      const name = current.typeName.text;
      if (name === 'Readonly' && current.typeArguments?.length === 1) {
        current = current.typeArguments[0];
        continue;
      }
      const declaration = declarations.get(name);
      if (!declaration) return current;
      if (ts.isInterfaceDeclaration(declaration)) return declaration;
      current = declaration.type;
    } else return current;
  }
  return undefined;
}

/** Number of coordinates of a fixed-length tuple type, or null (arrays, rest or optional elements). */
export function tupleLength(type: ts.TypeNode | undefined, declarations: TypeDeclarations): number | null {
  const resolved = resolveType(type, declarations);
  if (!resolved || !ts.isTupleTypeNode(resolved) || resolved.elements.length === 0) return null;
  const fixed = resolved.elements.every((element) =>
    ts.isNamedTupleMember(element) ? !element.questionToken && !element.dotDotDotToken : !ts.isOptionalTypeNode(element) && !ts.isRestTypeNode(element),
  );
  return fixed ? resolved.elements.length : null;
}

export function isFloat64ArrayType(type: ts.TypeNode | undefined, declarations: TypeDeclarations): boolean {
  const resolved = resolveType(type, declarations);
  return !!resolved && ts.isTypeReferenceNode(resolved) && ts.isIdentifier(resolved.typeName) && resolved.typeName.text === 'Float64Array';
}

/** Property names of an object type literal or same-file interface, or null for any other type. */
export function objectTypeKeys(type: ts.TypeNode | undefined, declarations: TypeDeclarations): string[] | null {
  const resolved = resolveType(type, declarations);
  if (!resolved) return null;
  const members = ts.isInterfaceDeclaration(resolved) ? resolved.members : ts.isTypeLiteralNode(resolved) ? resolved.members : null;
  if (!members) return null;
  return members.filter(ts.isPropertySignature).flatMap((member) => (propertyNameText(member.name) ?? []));
}

export function propertyNameText(name: ts.PropertyName): string | undefined {
  return ts.isIdentifier(name) || ts.isStringLiteral(name) || ts.isNumericLiteral(name) ? name.text : undefined;
}
