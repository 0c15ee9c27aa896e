export { ModelEditor, type ModelEditorProps } from './model-editor';
